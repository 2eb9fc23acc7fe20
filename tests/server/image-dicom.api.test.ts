import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { decodeDicom } from '../../server/images/dicom/decode-dicom'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  type TestUser,
} from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { uploadPhantomFilm } from '../support/api-films'
import { binaryParser } from '../support/download-bytes'

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let film: Phantom
let imageId: number

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-dicom-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  film = await smallPhantomFiles({
    patient: { name: 'MARCHBANKS^ISOLDE', id: 'MRN-404417', birthDate: '19580709', sex: 'F' },
  })
}, 60_000)
afterAll(async () => {
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})
beforeEach(async () => {
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  const patientId = await insertTestPatient(db, users.fellow.id, {
    familyName: 'Marchbanks',
    givenName: 'Isolde',
    recordNumber: 'MRN-404417',
    birthDate: '1958-07-09',
    studyCode: 'EP-DCM001',
  })
  const visitId = await insertTestVisit(db, patientId, users.fellow.id)
  await insertStudyWith(db, users.researcher.id, [patientId])
  imageId = await uploadPhantomFilm(app, users.fellow.cookie, visitId, film)
}, 60_000)

describe('GET /api/images/:id/dicom', () => {
  it('gives a study researcher the film de-identified: no name, record number or birth date in any byte', async () => {
    const res = await request(app)
      .get(`/api/images/${imageId}/dicom`)
      .set('Cookie', users.researcher.cookie)
      .buffer(true)
      .parse(binaryParser)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('application/dicom')
    expect(res.headers['content-disposition']).toBe(
      `attachment; filename="EP-DCM001-film-${imageId}.dcm"`,
    )
    const bytes = res.body as Buffer
    const text = bytes.toString('latin1')
    for (const needle of [
      'MARCHBANKS',
      'Marchbanks',
      'ISOLDE',
      'MRN-404417',
      '19580709',
      '1958-07-09',
    ]) {
      expect(text).not.toContain(needle)
    }
    expect(film.dicom.toString('latin1')).toContain('MARCHBANKS')
    const [before, after] = await Promise.all([decodeDicom(film.dicom), decodeDicom(bytes)])
    expect(Buffer.from(after.pixels.buffer).equals(Buffer.from(before.pixels.buffer))).toBe(true)
    expect(after.header?.spacing).toEqual(before.header?.spacing)
    const [event] = await db(TABLES.auditEvents).where({ action: 'export', entity: 'image' })
    expect(event).toMatchObject({ user_id: users.researcher.id, entity_id: String(imageId) })
  })

  it("answers 404 to a researcher outside the film's studies and 409 for a film that is not DICOM", async () => {
    const stranger = await createTestUser(db, config, 'researcher', 'stranger@test.example')
    const hidden = await request(app)
      .get(`/api/images/${imageId}/dicom`)
      .set('Cookie', stranger.cookie)
    expect(hidden.status).toBe(404)
    await db(TABLES.images).where({ id: imageId }).update({ file_kind: 'png' })
    const png = await request(app)
      .get(`/api/images/${imageId}/dicom`)
      .set('Cookie', users.surgeon.cookie)
    expect(png.status).toBe(409)
    expect(png.body.error.code).toBe('not_dicom')
  })
})

import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import dcmjs from 'dcmjs'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { binaryParser } from '../support/download-bytes'

const { DicomDict, DicomMessage, DicomMetaDictionary } = dcmjs.data

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let film: Phantom
let patientId: number
let visitId: number
let studyId: number

/**
 * The phantom's DICOM with Burned In Annotation (0028,0301) set to a value, or removed (null),
 * rewritten by dcmjs, a DICOM library independent of the project's own writer. The attribute
 * belongs to the General Image Module (DICOM PS3.3 C.7.6.1, table C.7-9); its values are YES and
 * NO (from memory of the standard's text).
 */
function withBurnedInAnnotation(dicom: Buffer, value: string | null): Buffer {
  const file = DicomMessage.readFile(
    dicom.buffer.slice(dicom.byteOffset, dicom.byteOffset + dicom.byteLength) as ArrayBuffer,
  )
  const dataset = DicomMetaDictionary.naturalizeDataset(file.dict)
  if (value === null) delete dataset.BurnedInAnnotation
  else dataset.BurnedInAnnotation = value
  const out = new DicomDict(file.meta)
  out.dict = DicomMetaDictionary.denaturalizeDataset(dataset)
  return Buffer.from(out.write())
}

async function upload(bytes: Buffer, name: string): Promise<number> {
  const res = await request(app)
    .post(`/api/visits/${visitId}/images`)
    .set('Cookie', users.fellow.cookie)
    .field('view', 'lateral-neutral')
    .field('confirmPatientMismatch', 'true')
    .attach('file', bytes, name)
  expect(res.status).toBe(201)
  return res.body[0].id as number
}

const as = (user: TestUser) => ({
  get: (path: string) => request(app).get(path).set('Cookie', user.cookie),
  put: (path: string, body: object) => request(app).put(path).set('Cookie', user.cookie).send(body),
})

/** Every route that hands out a film's pixels or its record, one film at a time. */
const PIXEL_ROUTES = [
  '',
  '/files/display',
  '/files/preview',
  '/files/thumbnail',
  '/files/full-depth',
  '/dicom',
] as const

async function researcherStatuses(imageId: number): Promise<Record<string, number>> {
  const statuses: Record<string, number> = {}
  for (const route of PIXEL_ROUTES) {
    const res = await request(app)
      .get(`/api/images/${imageId}${route}`)
      .set('Cookie', users.researcher.cookie)
      .buffer(true)
      .parse(binaryParser)
    statuses[route || 'record'] = res.status
  }
  return statuses
}

const everyRoute = (status: number) =>
  Object.fromEntries(PIXEL_ROUTES.map((route) => [route || 'record', status]))

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-pixel-review-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  film = await smallPhantomFiles()
}, 60_000)
afterAll(async () => {
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})
beforeEach(async () => {
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  patientId = await insertTestPatient(db, users.fellow.id)
  visitId = await insertTestVisit(db, patientId, users.fellow.id)
  studyId = await insertStudyWith(db, users.researcher.id, [patientId])
})

describe('recording Burned In Annotation (0028,0301) at upload', () => {
  it('records YES, NO, an absent attribute and an ordinary PNG as yes, no, unknown and unknown', async () => {
    const yes = await upload(withBurnedInAnnotation(film.dicom, 'YES'), 'yes.dcm')
    const no = await upload(withBurnedInAnnotation(film.dicom, 'NO'), 'no.dcm')
    const absent = await upload(withBurnedInAnnotation(film.dicom, null), 'absent.dcm')
    // A PNG has no header to make the claim (common practice: raster files carry no DICOM).
    const png = await upload(film.png, 'film.png')
    const rows = await db(TABLES.images).orderBy('id').select('id', 'burned_in_annotation')
    expect(rows).toEqual([
      { id: yes, burned_in_annotation: 'yes' },
      { id: no, burned_in_annotation: 'no' },
      { id: absent, burned_in_annotation: 'unknown' },
      { id: png, burned_in_annotation: 'unknown' },
    ])
    const record = await as(users.fellow).get(`/api/images/${yes}`)
    expect(record.body.pixelReview).toEqual({
      burnedInAnnotation: 'yes',
      cleared: false,
      clearedBy: null,
      clearedByName: null,
      clearedAt: null,
    })
  }, 60_000)

  it("records the phantom generator's films (the demo's) as no: its writer says NO", async () => {
    const phantom = await upload(film.dicom, 'phantom.dcm')
    const row = await db(TABLES.images).where({ id: phantom }).first('burned_in_annotation')
    expect(row.burned_in_annotation).toBe('no')
  }, 60_000)
})

describe('films held back from researchers', () => {
  it('answers 404 on every pixel route of an unknown film and leaves it out of lists, until a fellow clears it; withdrawing hides it again', async () => {
    const released = await upload(withBurnedInAnnotation(film.dicom, 'NO'), 'no.dcm')
    const unknown = await upload(withBurnedInAnnotation(film.dicom, null), 'absent.dcm')

    expect(await researcherStatuses(unknown)).toEqual(everyRoute(404))
    expect(await researcherStatuses(released)).toEqual(everyRoute(200))
    const list = await as(users.researcher).get(`/api/visits/${visitId}/images`)
    expect(list.body.map((image: { id: number }) => image.id)).toEqual([released])
    const study = await as(users.researcher).get(`/api/studies/${studyId}`)
    expect(study.body).toMatchObject({ filmCount: 1, heldBackFilmCount: 1 })
    const visits = await as(users.researcher).get(`/api/patients/${patientId}/visits`)
    expect(visits.body).toEqual([expect.objectContaining({ id: visitId, heldBackFilmCount: 1 })])
    // Clinicians see every film, and the count of those waiting for review.
    const clinical = await as(users.surgeon).get(`/api/visits/${visitId}/images`)
    expect(clinical.body).toHaveLength(2)

    const cleared = await as(users.fellow).put(`/api/images/${unknown}/pixel-review`, {
      cleared: true,
    })
    expect(cleared.status).toBe(200)
    expect(cleared.body.pixelReview).toMatchObject({
      burnedInAnnotation: 'unknown',
      cleared: true,
      clearedBy: users.fellow.id,
      clearedByName: 'Test fellow',
    })
    expect(await researcherStatuses(unknown)).toEqual(everyRoute(200))
    const relisted = await as(users.researcher).get(`/api/visits/${visitId}/images`)
    expect(relisted.body.map((image: { id: number }) => image.id)).toEqual([released, unknown])
    // The researcher learns the film is cleared, not by whom or when.
    const seen = await as(users.researcher).get(`/api/images/${unknown}`)
    expect(seen.body.pixelReview).toEqual({
      burnedInAnnotation: 'unknown',
      cleared: true,
      clearedBy: null,
      clearedByName: null,
      clearedAt: null,
    })
    expect((await as(users.researcher).get(`/api/studies/${studyId}`)).body).toMatchObject({
      filmCount: 2,
      heldBackFilmCount: 0,
    })
    const revisited = await as(users.researcher).get(`/api/patients/${patientId}/visits`)
    expect(revisited.body[0].heldBackFilmCount).toBe(0)

    const withdrawn = await as(users.fellow).put(`/api/images/${unknown}/pixel-review`, {
      cleared: false,
    })
    expect(withdrawn.status).toBe(200)
    expect(withdrawn.body.pixelReview.cleared).toBe(false)
    expect(await researcherStatuses(unknown)).toEqual(everyRoute(404))

    const events = await db(TABLES.auditEvents)
      .where({ entity: 'image', entity_id: String(unknown), action: 'update' })
      .orderBy('id')
    expect(events.map((event) => [event.user_id, event.summary])).toEqual([
      [users.fellow.id, expect.stringMatching(/^Confirmed no identity in the pixels/)],
      [users.fellow.id, expect.stringMatching(/^Withdrew the confirmation/)],
    ])
  }, 90_000)

  it('refuses the review to researchers and administrators (403) and changes nothing', async () => {
    const unknown = await upload(withBurnedInAnnotation(film.dicom, null), 'absent.dcm')
    for (const user of [users.researcher, users.admin]) {
      const res = await as(user).put(`/api/images/${unknown}/pixel-review`, { cleared: true })
      expect(res.status).toBe(403)
    }
    const row = await db(TABLES.images).where({ id: unknown }).first()
    expect(row).toMatchObject({ pixels_cleared_by: null, pixels_cleared_at: null })
    expect(await researcherStatuses(unknown)).toEqual(everyRoute(404))
  }, 60_000)

  it('clears a film whose header says YES only with explicit confirmation, and still refuses its DICOM', async () => {
    const yes = await upload(withBurnedInAnnotation(film.dicom, 'YES'), 'yes.dcm')
    const plain = await as(users.surgeon).put(`/api/images/${yes}/pixel-review`, {
      cleared: true,
    })
    expect(plain.status).toBe(400)
    expect(plain.body.error.details).toHaveProperty('confirmHeaderSaysYes')
    expect(await researcherStatuses(yes)).toEqual(everyRoute(404))

    const confirmed = await as(users.surgeon).put(`/api/images/${yes}/pixel-review`, {
      cleared: true,
      confirmHeaderSaysYes: true,
    })
    expect(confirmed.status).toBe(200)
    // Renditions are served; the DICOM's own header still declares burned-in text.
    expect(await researcherStatuses(yes)).toEqual({ ...everyRoute(200), '/dicom': 409 })
  }, 60_000)
})

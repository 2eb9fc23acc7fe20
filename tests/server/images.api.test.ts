import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import sharp from 'sharp'
import dicomParser from 'dicom-parser'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { writeTestDicom } from './unit/images/dicom-fixture'
import { deflateBomb } from './unit/images/part10-writer'

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let visitId: number
let files: Awaited<ReturnType<typeof smallPhantomFiles>>
let otherPatientFiles: Awaited<ReturnType<typeof smallPhantomFiles>>

const PATIENT = {
  recordNumber: 'TST-IMG-1',
  familyName: 'Quillfeather',
  givenName: 'Odalys',
  birthDate: '1970-05-17',
}

/** Every file left in the uploads folder, temporary ones included. */
function filesOnDisk(): string[] {
  const walk = (dir: string): string[] =>
    readdirSync(dir, { withFileTypes: true }).flatMap((entry) =>
      entry.isDirectory() ? walk(join(dir, entry.name)) : [join(dir, entry.name)],
    )
  return walk(uploadDir)
}

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-uploads-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir, UPLOAD_MAX_MB: '3' }))
  files = await smallPhantomFiles({
    patient: { name: 'QUILLFEATHER^ODALYS', id: 'TST-IMG-1', birthDate: '1970-05-17', sex: 'F' },
    studyDate: '2026-03-02',
  })
  otherPatientFiles = await smallPhantomFiles({
    seed: 9,
    patient: { name: 'BRACKENRIDGE^TOMAS', id: 'OTHER-9', birthDate: '1955-01-01', sex: 'M' },
    studyDate: '2026-03-02',
  })
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  await truncateAll(db)
  for (const entry of readdirSync(uploadDir))
    rmSync(join(uploadDir, entry), { recursive: true, force: true })
  users = await createUsersForEveryRole(db, config)
  const patientId = await insertTestPatient(db, users.fellow.id, PATIENT)
  visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-02')
  await insertStudyWith(db, users.researcher.id, [patientId])
})

function upload(who: TestUser, buffer: Buffer, name: string, fields: Record<string, string> = {}) {
  const call = request(app).post(`/api/visits/${visitId}/images`).set('Cookie', who.cookie)
  for (const [key, value] of Object.entries(fields)) call.field(key, value)
  return call.attach('file', buffer, name)
}

describe('POST /api/visits/:id/images', () => {
  it('files a DICOM film with its header spacing and view, and makes every rendition', async () => {
    const res = await upload(users.fellow, files.dicom, 'lateral.dcm')
    expect(res.status).toBe(201)
    const [image] = res.body
    expect(image).toMatchObject({
      visitId,
      width: 750,
      height: 625,
      fileKind: 'dicom',
      view: 'lateral-neutral',
    })
    // The phantom writes Pixel Spacing = 0.6 mm detector pitch / 1.15 magnification with
    // Calibration Type GEOMETRY: calibrated in the patient, first in the order of trust
    // (DICOM PS3.3 §10.7.1.1).
    expect(image.spacingSource).toBe('dicom-pixel-spacing')
    expect(image.mmPerPixel[0]).toBeCloseTo(0.6 / 1.15, 9)
    expect(image.mmPerPixel[1]).toBeCloseTo(0.6 / 1.15, 9)
    expect(image.dicom.patient.id).toBe('TST-IMG-1')
    expect(image.contentHash).toMatch(/^[0-9a-f]{64}$/)

    for (const [name, maxSide] of [
      ['display', 750],
      ['preview', 750],
      ['thumbnail', 256],
      ['full-depth', 750],
    ] as const) {
      const file = await request(app)
        .get(`/api/images/${image.id}/files/${name}`)
        .set('Cookie', users.surgeon.cookie)
        .buffer(true)
        .parse((response, done) => {
          const chunks: Buffer[] = []
          response.on('data', (chunk: Buffer) => chunks.push(chunk))
          response.on('end', () => done(null, Buffer.concat(chunks)))
        })
      expect(file.status).toBe(200)
      // Identified films are not kept by the browser; the ETag still allows revalidation.
      expect(file.headers['cache-control']).toBe('no-store')
      expect(file.headers.etag).toBe(`"${image.id}-${name}"`)
      const meta = await sharp(file.body as Buffer).metadata()
      expect(Math.max(meta.width ?? 0, meta.height ?? 0)).toBe(maxSide)
      // Only the full-depth rendition keeps 16 bits per sample for window/level in the client.
      expect(meta.depth).toBe(name === 'full-depth' ? 'ushort' : 'uchar')
    }
    // RFC 9110 §13.1.2: a matching If-None-Match answers 304 without the body.
    const revalidated = await request(app)
      .get(`/api/images/${image.id}/files/display`)
      .set('Cookie', users.surgeon.cookie)
      .set('If-None-Match', `"${image.id}-display"`)
    expect(revalidated.status).toBe(304)
    expect(revalidated.headers['cache-control']).toBe('no-store')
    const stored = filesOnDisk()
    expect(
      stored.some((path) => path.endsWith('original.dcm') && path.includes(image.contentHash)),
    ).toBe(true)
    expect(stored.some((path) => path.startsWith(join(uploadDir, 'tmp')))).toBe(false)
    expect(await db(TABLES.auditEvents).where({ entity: 'image', action: 'create' })).toHaveLength(
      1,
    )
  })

  it('keeps the original bytes exactly, readable by an independent DICOM parser', async () => {
    const res = await upload(users.fellow, files.dicom, 'lateral.dcm')
    const original = filesOnDisk().find((path) => path.endsWith('original.dcm'))!
    const { readFileSync } = await import('node:fs')
    const bytes = readFileSync(original)
    expect(Buffer.compare(bytes, files.dicom)).toBe(0)
    const dataSet = dicomParser.parseDicom(new Uint8Array(bytes))
    expect(dataSet.uint16('x00280010')).toBe(res.body[0].height)
  })

  it('asks for confirmation before attaching a film of another patient, then attaches it when confirmed', async () => {
    const refused = await upload(users.fellow, otherPatientFiles.dicom, 'other.dcm')
    expect(refused.status).toBe(409)
    expect(refused.body.error.code).toBe('patient_mismatch')
    expect(refused.body.error.details.mismatches[0]).toMatch(/name is "BRACKENRIDGE, TOMAS"/)
    // The answer echoes the header's identity: that read is audited, without the identity itself.
    const shown = await db(TABLES.auditEvents).where({ entity: 'visit', action: 'view' })
    expect(shown).toHaveLength(1)
    expect(shown[0]).toMatchObject({ user_id: users.fellow.id, entity_id: String(visitId) })
    expect(shown[0].summary).toMatch(/header identity of 1 file/)
    expect(shown[0].summary).not.toMatch(/BRACKENRIDGE/)
    expect(await db(TABLES.images).count({ c: '*' })).toEqual([{ c: 0 }])
    expect(filesOnDisk()).toEqual([])
    const confirmed = await upload(users.fellow, otherPatientFiles.dicom, 'other.dcm', {
      confirmPatientMismatch: 'true',
    })
    expect(confirmed.status).toBe(201)
    const event = await db(TABLES.auditEvents).where({ entity: 'image', action: 'create' }).first()
    expect(event.summary).toMatch(/patient mismatch confirmed/)
  })

  it('files a PNG with the chosen view and no spacing', async () => {
    const res = await upload(users.surgeon, files.png, 'flexion.png', { view: 'lateral-flexion' })
    expect(res.status).toBe(201)
    expect(res.body[0]).toMatchObject({
      fileKind: 'png',
      view: 'lateral-flexion',
      mmPerPixel: null,
      spacingSource: 'none',
      dicom: null,
      bitsStored: 16,
    })
  })

  it('asks for the view of a plain image file', async () => {
    const res = await upload(users.fellow, files.png, 'film.png')
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/choose a view/)
    expect(filesOnDisk()).toEqual([])
  })

  it('refuses the same film twice on one visit', async () => {
    await upload(users.fellow, files.dicom, 'a.dcm').expect(201)
    const again = await upload(users.fellow, files.dicom, 'b.dcm')
    expect(again.status).toBe(409)
    expect(await db(TABLES.images).count({ c: '*' })).toEqual([{ c: 1 }])
  })

  it('files nothing of a several-file upload when one of its films fails at filing', async () => {
    // The PNG is new; the same DICOM twice in one request fails on the second copy, under the
    // lock, after the PNG's and the first DICOM's files were moved in: all of it is undone.
    const res = await request(app)
      .post(`/api/visits/${visitId}/images`)
      .set('Cookie', users.fellow.cookie)
      .field('view', 'lateral-neutral')
      .field('confirmPatientMismatch', 'true')
      .attach('file', files.png, 'new.png')
      .attach('file', files.dicom, 'first.dcm')
      .attach('file', files.dicom, 'second.dcm')
    expect(res.status).toBe(409)
    expect(res.body.error.message).toMatch(/second\.dcm/)
    expect(await db(TABLES.images).count({ c: '*' })).toEqual([{ c: 0 }])
    expect(await db(TABLES.filmFiles).count({ c: '*' })).toEqual([{ c: 0 }])
    expect(filesOnDisk()).toEqual([])
  })

  it.each([
    [
      'a text file named .dcm',
      Buffer.from('this is not a film at all, only words\n'.repeat(20)),
      'fake.dcm',
      415,
      /not a DICOM|not a film|file type|recogni/i,
    ],
    ['an empty file', Buffer.alloc(0), 'empty.png', 422, /empty/i],
    ['a truncated PNG', () => files.png.subarray(0, 2000), 'cut.png', 422, /.+/],
    [
      'a corrupted DICOM',
      () => Buffer.concat([files.dicom.subarray(0, 400), Buffer.alloc(200, 0xff)]),
      'broken.dcm',
      422,
      /.+/,
    ],
  ] as const)(
    'refuses %s with a clear 4xx, leaving no row and no file',
    async (_label, bytes, name, status, message) => {
      const buffer = typeof bytes === 'function' ? bytes() : bytes
      const res = await upload(users.fellow, buffer, name, { view: 'lateral-neutral' })
      expect(res.status).toBe(status)
      expect(res.body.error.message).toMatch(message)
      expect(res.body.error.message).toContain(name)
      expect(await db(TABLES.images).count({ c: '*' })).toEqual([{ c: 0 }])
      expect(filesOnDisk()).toEqual([])
    },
  )

  it('refuses a file over the size limit with 413 and leaves nothing behind', async () => {
    const res = await upload(users.fellow, Buffer.alloc(4 * 1024 * 1024, 1), 'huge.dcm')
    expect(res.status).toBe(413)
    expect(res.body.error.message).toMatch(/3 MB/)
    expect(filesOnDisk()).toEqual([])
  })

  it('never uses the client file name as a path', async () => {
    const res = await upload(users.fellow, files.png, '../../../etc/evil.png', { view: 'ap' })
    expect(res.status).toBe(201)
    const paths = filesOnDisk()
    expect(paths.every((path) => path.startsWith(uploadDir) && !path.includes('evil'))).toBe(true)
    expect((await db(TABLES.images).first()).original_name).toBe('evil.png')
  })

  it('refuses a researcher and an administrator before reading the upload', async () => {
    expect((await upload(users.researcher, files.png, 'x.png', { view: 'ap' })).status).toBe(403)
    expect((await upload(users.admin, files.png, 'x.png', { view: 'ap' })).status).toBe(403)
    expect(filesOnDisk()).toEqual([])
  })

  it('answers 404 for an unknown visit and removes the streamed file', async () => {
    const res = await request(app)
      .post('/api/visits/987654/images')
      .set('Cookie', users.fellow.cookie)
      .field('view', 'ap')
      .attach('file', files.png, 'x.png')
    expect(res.status).toBe(404)
    expect(filesOnDisk()).toEqual([])
  })

  it('refuses an unknown view name', async () => {
    const res = await upload(users.fellow, files.png, 'x.png', { view: 'sideways' })
    expect(res.status).toBe(400)
    expect(filesOnDisk()).toEqual([])
  })
})

describe('reading and deleting films', () => {
  it("lists a visit's films, hides header identity from researchers, and lets nobody outside fetch them", async () => {
    const [image] = (await upload(users.fellow, files.dicom, 'lateral.dcm')).body
    const list = await request(app)
      .get(`/api/visits/${visitId}/images`)
      .set('Cookie', users.researcher.cookie)
    expect(list.status).toBe(200)
    expect(list.body).toHaveLength(1)
    const text = JSON.stringify(list.body)
    expect(text).not.toContain('QUILLFEATHER')
    expect(text).not.toContain('TST-IMG-1')
    expect(text).not.toContain('1970-05-17')
    // No timestamps (they betray the visit date) and no content hash (a link to the source file).
    expect(list.body[0]).toMatchObject({ createdAt: null, acquiredAt: null, contentHash: null })
    expect(text).not.toContain(image.contentHash)
    expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}/)
    // Clinicians get the header identity one film at a time, and that view is audited.
    const clinicianList = await request(app)
      .get(`/api/visits/${visitId}/images`)
      .set('Cookie', users.surgeon.cookie)
    expect(clinicianList.body[0].dicom.patient).toBeUndefined()
    const one = await request(app)
      .get(`/api/images/${image.id}`)
      .set('Cookie', users.surgeon.cookie)
    expect(one.body.dicom.patient).toMatchObject({ id: 'TST-IMG-1', birthDate: '1970-05-17' })
    expect(
      await db(TABLES.auditEvents).where({
        entity: 'image',
        action: 'view',
        user_id: users.surgeon.id,
      }),
    ).toHaveLength(1)
    expect(
      (
        await request(app)
          .get(`/api/images/${image.id}/files/thumbnail`)
          .set('Cookie', users.researcher.cookie)
      ).status,
    ).toBe(200)

    await db(TABLES.studyPatients).delete()
    expect(
      (await request(app).get(`/api/images/${image.id}`).set('Cookie', users.researcher.cookie))
        .status,
    ).toBe(404)
    expect(
      (
        await request(app)
          .get(`/api/images/${image.id}/files/display`)
          .set('Cookie', users.researcher.cookie)
      ).status,
    ).toBe(404)
    expect((await request(app).get(`/api/images/${image.id}/files/display`)).status).toBe(401)
    expect(
      (
        await request(app)
          .get(`/api/images/${image.id}/files/display`)
          .set('Cookie', users.admin.cookie)
      ).status,
    ).toBe(403)
  })

  it('deletes a film without readings, with its files', async () => {
    const [image] = (await upload(users.fellow, files.dicom, 'lateral.dcm')).body
    const res = await request(app)
      .delete(`/api/images/${image.id}`)
      .set('Cookie', users.fellow.cookie)
    expect(res.status).toBe(204)
    expect(await db(TABLES.images).count({ c: '*' })).toEqual([{ c: 0 }])
    expect(filesOnDisk()).toEqual([])
    expect(await db(TABLES.auditEvents).where({ entity: 'image', action: 'delete' })).toHaveLength(
      1,
    )
  })
})

describe('PATCH /api/images/:id/calibration', () => {
  it('stores a manual calibration from a line over a 25 mm sphere by default', async () => {
    const [image] = (await upload(users.fellow, files.png, 'film.png', { view: 'lateral-neutral' }))
      .body
    // A horizontal line of 200 px over a 25 mm object: 25 / 200 = 0.125 mm per pixel.
    const res = await request(app)
      .patch(`/api/images/${image.id}/calibration`)
      .set('Cookie', users.fellow.cookie)
      .send({
        line: [
          [100, 100],
          [300, 100],
        ],
        version: image.version,
      })
    expect(res.status).toBe(200)
    expect(res.body.spacingSource).toBe('manual')
    expect(res.body.mmPerPixel[0]).toBeCloseTo(0.125, 12)
    expect(res.body.mmPerPixel[1]).toBeCloseTo(0.125, 12)
    expect(res.body.manualCalibration).toMatchObject({ lengthMm: 25, lengthPx: 200 })
    const stale = await request(app)
      .patch(`/api/images/${image.id}/calibration`)
      .set('Cookie', users.surgeon.cookie)
      .send({
        line: [
          [0, 0],
          [100, 0],
        ],
        lengthMm: 10,
        version: image.version,
      })
    expect(stale.status).toBe(409)
  })

  it('keeps the pixel aspect of a film with non-square pixels', async () => {
    const [image] = (await upload(users.fellow, files.dicom, 'lateral.dcm')).body
    await db(TABLES.images)
      .where({ id: image.id })
      .update({ mm_per_pixel_row: 0.2, mm_per_pixel_column: 0.1 })
    // A vertical line of 100 px: with row spacing twice the column spacing, its length is
    // 100·row mm = 50 mm, so row = 0.5 and column = 0.25 mm per pixel.
    const res = await request(app)
      .patch(`/api/images/${image.id}/calibration`)
      .set('Cookie', users.fellow.cookie)
      .send({
        line: [
          [10, 10],
          [10, 110],
        ],
        lengthMm: 50,
        version: image.version,
      })
    expect(res.status).toBe(200)
    expect(res.body.mmPerPixel[0]).toBeCloseTo(0.5, 12)
    expect(res.body.mmPerPixel[1]).toBeCloseTo(0.25, 12)
  })

  it.each([
    [
      {
        line: [
          [0, 0],
          [2, 0],
        ],
        version: 1,
      },
      /at least 5 pixels/,
    ],
    [
      {
        line: [
          [0, 0],
          [5000, 0],
        ],
        version: 1,
      },
      /outside/,
    ],
    [{ line: [[0, 0]], version: 1 }, /line/],
    [
      {
        line: [
          [0, 0],
          [100, 0],
        ],
        lengthMm: -3,
        version: 1,
      },
      /lengthMm/,
    ],
  ])('answers 400 for %j and keeps the spacing', async (body, message) => {
    const [image] = (await upload(users.fellow, files.png, 'film.png', { view: 'lateral-neutral' }))
      .body
    const res = await request(app)
      .patch(`/api/images/${image.id}/calibration`)
      .set('Cookie', users.fellow.cookie)
      .send(body)
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(message)
    expect((await db(TABLES.images).where({ id: image.id }).first()).spacing_source).toBe('none')
  })
})

describe('broken uploads and missing files', () => {
  it('answers 400 to a multipart body cut short', async () => {
    const boundary = '----endplate-test'
    const body = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut.dcm"\r\nContent-Type: application/dicom\r\n\r\nDICM-partial`
    const res = await request(app)
      .post(`/api/visits/${visitId}/images`)
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', `multipart/form-data; boundary=${boundary}`)
      .send(body)
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('upload_refused')
    // Our words, never busboy's ("Unexpected end of form").
    expect(res.body.error.message).toMatch(/ended before its last part/)
    expect(res.body.error.message).not.toMatch(/unexpected end/i)
    expect(filesOnDisk()).toEqual([])
  })

  it('answers 413 in our words when the files of one upload add up past the request limit', async () => {
    const limited = buildTestApp(db, {
      UPLOAD_DIR: uploadDir,
      UPLOAD_MAX_MB: '3',
      UPLOAD_REQUEST_MAX_MB: '1',
    }).app
    // Two 0.6 MB files: each under the 3 MB file limit, together over the 1 MB request limit.
    const part = Buffer.alloc(600 * 1024, 7)
    const res = await request(limited)
      .post(`/api/visits/${visitId}/images`)
      .set('Cookie', users.fellow.cookie)
      .attach('file', part, 'one.png')
      .attach('file', part, 'two.png')
    expect(res.status).toBe(413)
    expect(res.body.error).toMatchObject({ code: 'too_large' })
    expect(res.body.error.message).toMatch(/add up to 1 MB at most/)
    expect(filesOnDisk()).toEqual([])
    expect(await db(TABLES.images).count({ n: '*' })).toEqual([{ n: 0 }])
  })

  it('answers 400 in our words to an upload with more parts than 20 files and 50 fields', async () => {
    const call = request(app)
      .post(`/api/visits/${visitId}/images`)
      .set('Cookie', users.fellow.cookie)
    for (let i = 0; i < 50; i++) call.field(`extra${i}`, 'x')
    for (let i = 0; i < 21; i++) call.attach('file', Buffer.from('x'), `f${i}.png`)
    const res = await call
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('upload_refused')
    expect(res.body.error.message).toMatch(/too many parts|at most 20 files/i)
    // multer's own texts ("Too many parts", "Too many files") never reach the client.
    expect(res.body.error.message).not.toMatch(/^Too many/)
    expect(filesOnDisk()).toEqual([])
  })

  it('answers 404 without cache headers when a rendition is missing from storage', async () => {
    const [image] = (await upload(users.fellow, files.png, 'film.png', { view: 'ap' })).body
    for (const path of filesOnDisk()) if (path.includes('thumbnail')) rmSync(path)
    const res = await request(app)
      .get(`/api/images/${image.id}/files/thumbnail`)
      .set('Cookie', users.fellow.cookie)
    expect(res.status).toBe(404)
    expect(res.headers['cache-control'] ?? 'none').not.toMatch(/immutable/)
  })
})

describe('spacing a radiograph cannot have', () => {
  it('files a DICOM with Pixel Spacing 1e308\\1e308 as uncalibrated, with a note giving the range', async () => {
    const dicom = writeTestDicom({
      width: 64,
      height: 48,
      attributes: { PixelSpacing: [1e308, 1e308], PixelSpacingCalibrationType: 'GEOMETRY' },
    })
    const res = await upload(users.fellow, dicom, 'absurd.dcm', {
      view: 'lateral-neutral',
      confirmPatientMismatch: 'true',
    })
    expect(res.status).toBe(201)
    expect(res.body[0].mmPerPixel).toBeNull()
    expect(res.body[0].spacingSource).toBe('none')
    expect(res.body[0].spacingNote).toMatch(/outside the 0\.01–5 mm/)
  })

  it('keeps the angles and percentages of a reading on a film whose stored spacing is absurd', async () => {
    const [image] = (await upload(users.fellow, files.png, 'film.png', { view: 'lateral-neutral' }))
      .body
    // A row written before the range check existed.
    await db(TABLES.images).where({ id: image.id }).update({
      mm_per_pixel_row: 1e308,
      mm_per_pixel_column: 1e308,
      spacing_source: 'dicom-pixel-spacing',
    })
    // Example 1 of the measurement literature scaled into the 750 × 625 film: a 30 px slip over
    // a 300 px S1 endplate is 10 % (Taillard, as described by Butt & Saifuddin 2005).
    const points = {
      'L5.as': [410, 300],
      'L5.ps': [110, 300],
      'L5.pi': [130, 540],
      'L5.ai': [430, 540],
      'S1.ps': [100, 600],
      'S1.as': [400, 600],
    }
    const res = await request(app)
      .post(`/api/images/${image.id}/readings`)
      .set('Cookie', users.fellow.cookie)
      .send({ template: 'slip-grade', options: { segment: 'L5-S1' }, points })
    expect(res.status).toBe(201)
    const segment = res.body.results.measurements.segments['L5-S1']
    expect(segment.slipPercent).toBeCloseTo(10, 9)
    expect(segment.segmentalLordosisDeg).not.toBeNull()
    expect(segment.slipMm).toBeNull()
  })

  it('refuses a manual calibration that gives a spacing outside 0.01–5 mm', async () => {
    const [image] = (await upload(users.fellow, files.png, 'film.png', { view: 'lateral-neutral' }))
      .body
    // 1000 mm over 10 px is 100 mm per pixel.
    const res = await request(app)
      .patch(`/api/images/${image.id}/calibration`)
      .set('Cookie', users.fellow.cookie)
      .send({
        line: [
          [0, 0],
          [10, 0],
        ],
        lengthMm: 1000,
        version: image.version,
      })
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/0\.01–5 mm/)
    const stored = await db(TABLES.images).where({ id: image.id }).first()
    expect(stored.mm_per_pixel_row).toBeNull()
  })
})

describe('hostile files', () => {
  it('refuses a deflated DICOM that would inflate to 2 GiB with 422, and files nothing', async () => {
    const bomb = deflateBomb(2 * 2 ** 30 - 2)
    const res = await upload(users.fellow, bomb, 'bomb.dcm', { view: 'lateral-neutral' })
    expect(res.status).toBe(422)
    expect(res.body.error.message).toMatch(/bomb\.dcm: .*inflates to more than/)
    expect(await db(TABLES.images).count({ n: '*' })).toEqual([{ n: 0 }])
    expect(filesOnDisk()).toEqual([])
  })
})

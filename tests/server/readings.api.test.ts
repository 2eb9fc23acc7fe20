import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { APP_VERSION } from '../../server/version'
import { flexionExtensionPair } from '../../server/phantom/motion-pair'
import type { PhantomParamsInput } from '../../server/phantom/phantom-params'
import type { Role, VisitKind } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import { templateLandmarks, type TemplateOptions } from '../../shared/readings/templates'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  type TestUser,
} from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'

type Points = Record<string, PixelPoint>
type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let patientId: number
let visitId: number
let neutral: Phantom
let flexion: Phantom
let extension: Phantom
let constructed: Phantom
let frontal: Phantom

const PATIENT = {
  recordNumber: 'TST-RDG-1',
  familyName: 'Quillfeather',
  givenName: 'Odalys',
  birthDate: '1970-05-17',
}
const HEADER = {
  patient: {
    name: 'QUILLFEATHER^ODALYS',
    id: 'TST-RDG-1',
    birthDate: '1970-05-17',
    sex: 'F' as const,
  },
  studyDate: '2026-03-02',
}
// An invented degenerative slip of 14 % at L4-L5 (phantom parameter; the engine must give it back).
const NEUTRAL: PhantomParamsInput = { ...HEADER, segments: { 'L4-L5': { slipPercent: 14 } } }
/** The phantom's detector pitch over its magnification: the header's Pixel Spacing. */
const MM_PER_PIXEL = 0.6 / 1.15

/** The L4-L5 landmarks of the slip-grade template, at the phantom's exact positions. */
const L4_L5 = ['L4.as', 'L4.ps', 'L4.pi', 'L4.ai', 'L5.as', 'L5.ps', 'L5.pi', 'L5.ai']
const pick = (film: Phantom, names: string[]): Points =>
  Object.fromEntries(names.map((name) => [name, film.film.landmarks.points[name] as PixelPoint]))
/** Every landmark a construct check asks for, at the phantom's exact positions. */
const constructPoints = (film: Phantom, options: TemplateOptions): Points =>
  pick(
    film,
    templateLandmarks('construct-check', options).map((spec) => spec.name),
  )

/**
 * Taillard slip by hand (Butt & Saifuddin 2005, Clin Radiol 60:533): d = (U.pi − W.ps)·a with
 * a = (W.as − W.ps)/|W.as − W.ps|, as a percentage of |W.as − W.ps|.
 */
function taillardPercent(points: Points, upper: string, lower: string): number {
  const [upx, upy] = points[`${upper}.pi`] as PixelPoint
  const [psx, psy] = points[`${lower}.ps`] as PixelPoint
  const [asx, asy] = points[`${lower}.as`] as PixelPoint
  const ex = asx - psx
  const ey = asy - psy
  const depth = Math.sqrt(ex * ex + ey * ey)
  const d = ((upx - psx) * ex + (upy - psy) * ey) / depth
  return (100 * d) / depth
}

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-readings-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  neutral = await smallPhantomFiles(NEUTRAL)
  // A frontal film after surgery: invented disc replacements 2.6 mm toward the image's right
  // (the patient's left, Patient Orientation L\F) at L4-L5, 1 mm the other way at L3-L4.
  frontal = await smallPhantomFiles({
    ...HEADER,
    view: 'ap',
    seriesDescription: 'LUMBAR SPINE AP',
    widthPx: 625,
    heightPx: 750,
    implants: [
      { kind: 'disc-replacement', segment: 'L4-L5', lateralOffsetMm: 2.6, coronalTiltDeg: 4 },
      { kind: 'disc-replacement', segment: 'L3-L4', lateralOffsetMm: -1 },
    ],
  })
  // The same spine after surgery: invented cages at L3-L4 and L4-L5.
  constructed = await smallPhantomFiles({
    ...NEUTRAL,
    implants: [
      { kind: 'cage', segment: 'L3-L4' },
      { kind: 'cage', segment: 'L4-L5' },
    ],
  })
  // Invented motion: 12° range and 8 % translation at L4-L5 between flexion and extension.
  const pair = flexionExtensionPair(
    { widthPx: 750, heightPx: 625, detectorPixelMm: 0.6, ...NEUTRAL },
    { segment: 'L4-L5', angularRangeDeg: 12, translationPercent: 8 },
  )
  flexion = await smallPhantomFiles(pair.flexion as PhantomParamsInput)
  extension = await smallPhantomFiles(pair.extension as PhantomParamsInput)
}, 60_000)
afterAll(async () => {
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})
beforeEach(async () => {
  await truncateAll(db)
  for (const entry of readdirSync(uploadDir))
    rmSync(join(uploadDir, entry), { recursive: true, force: true })
  users = await createUsersForEveryRole(db, config)
  patientId = await insertTestPatient(db, users.fellow.id, PATIENT)
  visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-02')
  await insertStudyWith(db, users.researcher.id, [patientId])
})

async function uploadFilm(film: Phantom, view: string, toVisit = visitId): Promise<number> {
  const res = await request(app)
    .post(`/api/visits/${toVisit}/images`)
    .set('Cookie', users.fellow.cookie)
    .field('view', view)
    .field('confirmPatientMismatch', 'true')
    .attach('file', film.dicom, `${view}.dcm`)
  expect(res.status).toBe(201)
  return res.body[0].id as number
}

const post = (who: TestUser, imageId: number, body: object) =>
  request(app).post(`/api/images/${imageId}/readings`).set('Cookie', who.cookie).send(body)
const patch = (who: TestUser, id: number, body: object) =>
  request(app).patch(`/api/readings/${id}`).set('Cookie', who.cookie).send(body)
const submit = (who: TestUser, id: number, version: number) =>
  request(app).post(`/api/readings/${id}/submit`).set('Cookie', who.cookie).send({ version })
const readingCount = async () =>
  Number(((await db(TABLES.readings).count({ n: '*' })) as [{ n: number }])[0].n)

describe('POST /api/images/:id/readings', () => {
  it('starts a draft and recomputes the phantom slip from its ground-truth landmarks', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const points = pick(neutral, L4_L5)
    const res = await post(users.fellow, imageId, {
      template: 'slip-grade',
      options: { segment: 'L4-L5' },
      points,
    })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      imageId,
      template: 'slip-grade',
      options: { segment: 'L4-L5' },
      status: 'draft',
      version: 1,
      raterId: users.fellow.id,
      raterName: 'Test fellow',
      engineVersion: APP_VERSION,
    })
    const slip = res.body.results.measurements.segments['L4-L5'].slipPercent
    // Independent check: Taillard by hand arithmetic on the same points, and the phantom's own
    // parameter (14 %), both to 1e-6.
    expect(Math.abs(slip - taillardPercent(points, 'L4', 'L5'))).toBeLessThan(1e-6)
    expect(Math.abs(slip - 14)).toBeLessThan(1e-6)
    expect(res.body.results.measurements.segments['L4-L5'].meyerdingGrade).toBe('I')
    // Segments without landmarks are absent rather than empty.
    expect(res.body.results.measurements.segments['L5-S1']).toBeUndefined()
    expect(res.body.calibration.source).toBe('dicom-pixel-spacing')
    expect(res.body.calibration.mmPerPixel[0]).toBeCloseTo(MM_PER_PIXEL, 9)
    expect(res.body.landmarks.points).toEqual(points)
    // Site default σ = 1 mm on a calibrated film (measurement-reference §8).
    expect(res.body.results.uncertainty.sigma).toEqual({ value: 1, unit: 'mm' })
    expect(res.body.results.motion).toBeNull()
    expect(res.body.results.subsidence).toBeNull()
    const events = await db(TABLES.auditEvents).where({ entity: 'reading', action: 'create' })
    expect(events).toHaveLength(1)
  })

  it('uses the site landmark σ when one is set', async () => {
    await db(TABLES.siteSettings).insert({ key: 'landmarkSigmaMm', value: JSON.stringify(2) })
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const res = await post(users.surgeon, imageId, {
      template: 'slip-grade',
      options: { segment: 'L4-L5' },
      points: pick(neutral, L4_L5),
    })
    expect(res.status).toBe(201)
    expect(res.body.results.uncertainty.sigma).toEqual({ value: 2, unit: 'mm' })
  })

  it.each([
    [{ template: 'bogus-template' }, /template/],
    [{ template: 'slip-grade' }, /options\.segment.*required/],
    [{ template: 'slip-grade', options: { segment: 'L6-S1' } }, /options\.segment/],
    [{ template: 'construct-check', options: { construct: [] } }, /options\.construct/],
    [
      {
        template: 'construct-check',
        options: { construct: [{ segment: 'L4-L5', implant: 'screw' }] },
      },
      /implant/,
    ],
    [{ template: 'lumbar-alignment', options: { segment: 'L4-L5' } }, /does not apply/],
    [
      { template: 'slip-grade', options: { segment: 'L4-L5' }, points: { 'L1.as': [10, 10] } },
      /L1\.as/,
    ],
    [
      { template: 'slip-grade', options: { segment: 'L4-L5' }, points: { 'L4.as': [760, 10] } },
      /L4\.as.*outside/,
    ],
    [
      { template: 'slip-grade', options: { segment: 'L4-L5' }, points: { 'L4.as': [10, -1] } },
      /L4\.as.*outside/,
    ],
    [
      { template: 'slip-grade', options: { segment: 'L4-L5' }, points: { 'L4.as': [10, 'x'] } },
      /L4\.as/,
    ],
  ])('refuses %j with a 400 naming the problem and stores nothing', async (body, message) => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const res = await post(users.fellow, imageId, body)
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(message)
    expect(await readingCount()).toBe(0)
  })

  it('answers the engine refusal (a zero-length endplate) as 400 and stores nothing', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const points = {
      ...pick(neutral, L4_L5),
      'L5.as': neutral.film.landmarks.points['L5.ps'] as PixelPoint,
    }
    const res = await post(users.fellow, imageId, {
      template: 'slip-grade',
      options: { segment: 'L4-L5' },
      points,
    })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_landmarks')
    expect(res.body.error.message).toMatch(/L5/)
    expect(await readingCount()).toBe(0)
  })

  it('refuses writes by researchers and admins, and anonymous calls', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const body = { template: 'slip-grade', options: { segment: 'L4-L5' } }
    expect((await post(users.researcher, imageId, body)).status).toBe(403)
    expect((await post(users.admin, imageId, body)).status).toBe(403)
    expect((await request(app).post(`/api/images/${imageId}/readings`).send(body)).status).toBe(401)
    expect(await readingCount()).toBe(0)
  })
})

describe('GET /api/readings/:id and /api/images/:id/readings', () => {
  it('lets clinicians and study researchers read, newest first with rater names; others get 404', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const first = (
      await post(users.fellow, imageId, { template: 'slip-grade', options: { segment: 'L4-L5' } })
    ).body
    const second = (await post(users.surgeon, imageId, { template: 'lumbar-alignment' })).body
    const list = await request(app)
      .get(`/api/images/${imageId}/readings`)
      .set('Cookie', users.researcher.cookie)
    expect(list.status).toBe(200)
    expect(list.body.map((r: { id: number; raterName: string }) => [r.id, r.raterName])).toEqual([
      [second.id, 'Test surgeon'],
      [first.id, 'Test fellow'],
    ])
    const one = await request(app)
      .get(`/api/readings/${first.id}`)
      .set('Cookie', users.researcher.cookie)
    expect(one.status).toBe(200)
    expect(one.body.id).toBe(first.id)
    // No timestamps for researchers: a reading made on the visit day would date the visit.
    for (const reading of [one.body, ...list.body]) {
      expect(reading).toMatchObject({
        createdAt: null,
        updatedAt: null,
        submittedAt: null,
        signedAt: null,
      })
    }
    expect(JSON.stringify([one.body, list.body])).not.toMatch(/\d{4}-\d{2}-\d{2}T/)

    const outsider = await createTestUser(db, config, 'researcher', 'outsider@test.example')
    expect(
      (await request(app).get(`/api/readings/${first.id}`).set('Cookie', outsider.cookie)).status,
    ).toBe(404)
    expect(
      (await request(app).get(`/api/images/${imageId}/readings`).set('Cookie', outsider.cookie))
        .status,
    ).toBe(404)
    expect(
      (await request(app).get(`/api/readings/${first.id}`).set('Cookie', users.admin.cookie))
        .status,
    ).toBe(403)
    expect(
      (await request(app).get('/api/readings/999999').set('Cookie', users.fellow.cookie)).status,
    ).toBe(404)
  })
})

describe('PATCH /api/readings/:id', () => {
  it('saves landmarks, recomputes, and audits how many changed', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const created = (
      await post(users.fellow, imageId, { template: 'slip-grade', options: { segment: 'L4-L5' } })
    ).body
    expect(created.results.measurements.segments).toEqual({})
    const points = pick(neutral, L4_L5)
    const res = await patch(users.fellow, created.id, { points, version: 1 })
    expect(res.status).toBe(200)
    expect(res.body.version).toBe(2)
    expect(res.body.results.measurements.segments['L4-L5'].slipPercent).toBeCloseTo(
      taillardPercent(points, 'L4', 'L5'),
      6,
    )
    const [event] = await db(TABLES.auditEvents).where({ entity: 'reading', action: 'update' })
    expect(event.summary).toMatch(/8 landmarks changed \(8 added, 0 moved, 0 removed\)/)
  })

  it('answers a stale version with 409 and the current reading, and keeps the stored landmarks', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const created = (
      await post(users.fellow, imageId, { template: 'slip-grade', options: { segment: 'L4-L5' } })
    ).body
    const saved = pick(neutral, L4_L5)
    expect((await patch(users.fellow, created.id, { points: saved, version: 1 })).status).toBe(200)
    const stale = await patch(users.fellow, created.id, { points: { 'L4.as': [1, 1] }, version: 1 })
    expect(stale.status).toBe(409)
    expect(stale.body.error.code).toBe('conflict')
    expect(stale.body.current.version).toBe(2)
    expect(stale.body.current.landmarks.points).toEqual(saved)
    const row = await db(TABLES.readings).where({ id: created.id }).first()
    const stored = typeof row.landmarks === 'string' ? JSON.parse(row.landmarks) : row.landmarks
    expect(stored.points).toEqual(saved)
    expect(row.version).toBe(2)
  })

  it('lets only the rater edit (403 for another fellow or a surgeon, 403 for researchers)', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const created = (
      await post(users.fellow, imageId, { template: 'slip-grade', options: { segment: 'L4-L5' } })
    ).body
    const otherFellow = await createTestUser(db, config, 'fellow', 'second.fellow@test.example')
    const body = { points: pick(neutral, L4_L5), version: 1 }
    for (const who of [otherFellow, users.surgeon, users.researcher, users.admin]) {
      expect((await patch(who, created.id, body)).status).toBe(403)
    }
    expect((await db(TABLES.readings).where({ id: created.id }).first()).version).toBe(1)
  })

  it('refuses unknown landmarks, points off the film and the engine refusal without storing', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const created = (
      await post(users.fellow, imageId, { template: 'slip-grade', options: { segment: 'L4-L5' } })
    ).body
    const ps = neutral.film.landmarks.points['L5.ps'] as PixelPoint
    for (const [points, message] of [
      [{ 'S1.as': [10, 10] }, /S1\.as/],
      [{ 'L5.pi': [10, 626] }, /L5\.pi.*outside/],
      [{ ...pick(neutral, L4_L5), 'L5.as': ps }, /L5/],
    ] as const) {
      const res = await patch(users.fellow, created.id, { points, version: 1 })
      expect(res.status).toBe(400)
      expect(res.body.error.message).toMatch(message)
    }
    expect((await db(TABLES.readings).where({ id: created.id }).first()).version).toBe(1)
  })
})

describe('POST /api/readings/:id/submit', () => {
  it('submits a draft once; later edits and a second submit are refused', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const created = (
      await post(users.fellow, imageId, {
        template: 'slip-grade',
        options: { segment: 'L4-L5' },
        points: pick(neutral, L4_L5),
      })
    ).body
    expect((await submit(users.surgeon, created.id, 1)).status).toBe(403)
    const res = await submit(users.fellow, created.id, 1)
    expect(res.status).toBe(200)
    expect(res.body.status).toBe('submitted')
    expect(res.body.version).toBe(2)
    expect(Date.parse(res.body.submittedAt)).not.toBeNaN()
    const edit = await patch(users.fellow, created.id, { points: {}, version: 2 })
    expect(edit.status).toBe(409)
    expect(edit.body.error.message).toMatch(/submitted/)
    const again = await submit(users.fellow, created.id, 2)
    expect(again.status).toBe(409)
    expect(again.body.error.message).toMatch(/submitted/)
    expect(
      await db(TABLES.auditEvents).where({ entity: 'reading', action: 'submit' }),
    ).toHaveLength(1)
  })

  it('refuses to submit a reading with a required landmark missing, naming it', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const created = (
      await post(users.fellow, imageId, { template: 'slip-grade', options: { segment: 'L4-L5' } })
    ).body
    const res = await submit(users.fellow, created.id, 1)
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/^Place 8 required landmarks before submitting: L4 /)
    expect(Object.keys(res.body.error.details)).toContain('points.L5.ai')
    expect((await db(TABLES.readings).where({ id: created.id }).first()).status).toBe('draft')
  })

  it('answers a stale version with 409 and the current reading', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    const created = (
      await post(users.fellow, imageId, {
        template: 'slip-grade',
        options: { segment: 'L4-L5' },
        points: pick(neutral, L4_L5),
      })
    ).body
    expect(
      (
        await patch(users.fellow, created.id, {
          points: pick(neutral, L4_L5.slice(0, 6)),
          version: 1,
        })
      ).status,
    ).toBe(200)
    const res = await submit(users.fellow, created.id, 1)
    expect(res.status).toBe(409)
    expect(res.body.current.version).toBe(2)
    expect((await db(TABLES.readings).where({ id: created.id }).first()).status).toBe('draft')
  })
})

describe('DELETE /api/images/:id with readings', () => {
  it('keeps a film that has a reading', async () => {
    const imageId = await uploadFilm(neutral, 'lateral-neutral')
    expect((await post(users.fellow, imageId, { template: 'lumbar-alignment' })).status).toBe(201)
    const res = await request(app)
      .delete(`/api/images/${imageId}`)
      .set('Cookie', users.fellow.cookie)
    expect(res.status).toBe(409)
    expect(await db(TABLES.images).where({ id: imageId })).toHaveLength(1)
  })
})

describe('motion pairs', () => {
  it('reads flexion against extension of the same visit and reports the motion', async () => {
    const flexionId = await uploadFilm(flexion, 'lateral-flexion')
    const extensionId = await uploadFilm(extension, 'lateral-extension')
    const created = await post(users.fellow, flexionId, {
      template: 'motion-pair',
      options: { segment: 'L4-L5' },
      pairedImageId: extensionId,
    })
    expect(created.status).toBe(201)
    expect(created.body.pairedImageId).toBe(extensionId)
    const points = pick(flexion, L4_L5)
    const pairedPoints = pick(extension, L4_L5)
    const res = await patch(users.fellow, created.body.id, { points, pairedPoints, version: 1 })
    expect(res.status).toBe(200)
    const motion = res.body.results.motion.segments['L4-L5']
    // Translation % = |slip % flexion − slip % extension| (measurement-reference §6), each by
    // hand per Taillard; the phantom pair was drawn 8 % apart and 12° apart.
    const expected = Math.abs(
      taillardPercent(points, 'L4', 'L5') - taillardPercent(pairedPoints, 'L4', 'L5'),
    )
    expect(motion.translationPercent).toBeCloseTo(expected, 6)
    expect(motion.translationPercent).toBeCloseTo(8, 6)
    expect(motion.rangeOfMotionDeg).toBeCloseTo(12, 6)
    expect(motion.criteria.map((c: { id: string }) => c.id)).toContain('white-panjabi-1990')
    expect(res.body.pairedCalibration.mmPerPixel[1]).toBeCloseTo(MM_PER_PIXEL, 9)
    expect(res.body.pairedLandmarks.points).toEqual(pairedPoints)
  })

  it('refuses a motion pair without the extension film, on the wrong film, or across visits', async () => {
    const neutralId = await uploadFilm(neutral, 'lateral-neutral')
    const flexionId = await uploadFilm(flexion, 'lateral-flexion')
    const otherVisit = await insertTestVisit(db, patientId, users.fellow.id, '2026-04-02')
    const elsewhere = await uploadFilm(extension, 'lateral-extension', otherVisit)
    const cases: Array<[number, object, RegExp]> = [
      [flexionId, {}, /pairedImageId.*required/],
      [neutralId, { pairedImageId: flexionId }, /flexion film/],
      [flexionId, { pairedImageId: neutralId }, /extension/],
      [flexionId, { pairedImageId: elsewhere }, /same visit|this visit/],
    ]
    for (const [imageId, extra, message] of cases) {
      const res = await post(users.fellow, imageId, {
        template: 'motion-pair',
        options: { segment: 'L4-L5' },
        ...extra,
      })
      expect(res.status).toBe(400)
      expect(res.body.error.message).toMatch(message)
    }
    expect(await readingCount()).toBe(0)
  })
})

describe('construct checks', () => {
  async function visitOf(kind: VisitKind, date: string): Promise<number> {
    return insertTestVisit(db, patientId, users.fellow.id, date, kind)
  }

  it('measures subsidence against the first submitted post-op reading, not against drafts', async () => {
    const postOpImage = await uploadFilm(
      constructed,
      'lateral-neutral',
      await visitOf('post-op', '2026-03-10'),
    )
    const followUpImage = await uploadFilm(
      constructed,
      'lateral-neutral',
      await visitOf('follow-up', '2026-09-10'),
    )
    const construct: TemplateOptions = { construct: [{ segment: 'L4-L5', implant: 'cage' }] }
    const baselinePoints = constructPoints(constructed, construct)
    const baseline = (
      await post(users.fellow, postOpImage, {
        template: 'construct-check',
        options: construct,
        points: baselinePoints,
      })
    ).body
    // Later the posterior-inferior corner of L4 has come 40 % of the way down to L5's
    // posterior-superior corner (invented subsidence): the posterior height is then 60 % of before.
    const [pix, piy] = baselinePoints['L4.pi'] as PixelPoint
    const [psx, psy] = baselinePoints['L5.ps'] as PixelPoint
    const laterPoints: Points = {
      ...baselinePoints,
      'L4.pi': [pix + 0.4 * (psx - pix), piy + 0.4 * (psy - piy)],
    }
    const later = await post(users.surgeon, followUpImage, {
      template: 'construct-check',
      options: construct,
      points: laterPoints,
    })
    expect(later.status).toBe(201)
    // The baseline is still a draft: no subsidence yet.
    expect(later.body.results.subsidence).toBeNull()
    expect((await submit(users.fellow, baseline.id, 1)).status).toBe(200)

    const resaved = await patch(users.surgeon, later.body.id, { points: laterPoints, version: 1 })
    expect(resaved.status).toBe(200)
    expect(resaved.body.results.subsidenceBaselineReadingId).toBe(baseline.id)
    const result = resaved.body.results.subsidence['L4-L5']
    // Posterior disc height |U.pi − W.ps| (Dabbs two-point method) by hand, in mm.
    const before = Math.hypot(pix - psx, piy - psy) * MM_PER_PIXEL
    const after = 0.6 * before
    expect(result.segments['L4-L5'].lossMm.posterior).toBeCloseTo(before - after, 6)
    // More than 2 mm lost: flagged at the 2 mm default (Rao et al. 2017); anterior unchanged.
    expect(before - after).toBeGreaterThan(2)
    expect(result.thresholdMm).toBe(2)
    expect(result.segments['L4-L5'].posteriorFlagged).toBe(true)
    expect(result.segments['L4-L5'].lossMm.anterior).toBeCloseTo(0, 9)
    expect(result.segments['L4-L5'].anteriorFlagged).toBe(false)
    expect(result.source).toMatch(/Rao/)
  })

  it('does not measure a second rater on the same post-op film as subsidence', async () => {
    const postOpImage = await uploadFilm(
      constructed,
      'lateral-neutral',
      await visitOf('post-op', '2026-03-10'),
    )
    const construct: TemplateOptions = { construct: [{ segment: 'L4-L5', implant: 'cage' }] }
    const points = constructPoints(constructed, construct)
    const first = (
      await post(users.fellow, postOpImage, {
        template: 'construct-check',
        options: construct,
        points,
      })
    ).body
    expect((await submit(users.fellow, first.id, 1)).status).toBe(200)
    // The surgeon reads the same film again with the lower corner a little off: rater
    // disagreement, not subsidence, so no baseline applies on the same visit.
    const [x, y] = points['L4.pi'] as PixelPoint
    const second = await post(users.surgeon, postOpImage, {
      template: 'construct-check',
      options: construct,
      points: { ...points, 'L4.pi': [x, y + 20] },
    })
    expect(second.status).toBe(201)
    expect(second.body.results.subsidence).toBeNull()
  })

  it("takes each treated segment's baseline from the earliest reading that measured it", async () => {
    const firstOp = await uploadFilm(
      constructed,
      'lateral-neutral',
      await visitOf('post-op', '2026-03-10'),
    )
    const secondOp = await uploadFilm(
      constructed,
      'lateral-neutral',
      await visitOf('post-op', '2026-06-10'),
    )
    const followUp = await uploadFilm(
      constructed,
      'lateral-neutral',
      await visitOf('follow-up', '2026-09-10'),
    )
    const l3l4Points = constructPoints(constructed, {
      construct: [{ segment: 'L3-L4', implant: 'cage' }],
    })
    const early = (
      await post(users.fellow, firstOp, {
        template: 'construct-check',
        options: { construct: [{ segment: 'L4-L5', implant: 'cage' }] },
        points: constructPoints(constructed, {
          construct: [{ segment: 'L4-L5', implant: 'cage' }],
        }),
      })
    ).body
    await submit(users.fellow, early.id, 1)
    // A later operation treats L3-L4: its first post-op reading is that segment's baseline.
    const adjacent = (
      await post(users.fellow, secondOp, {
        template: 'construct-check',
        options: { construct: [{ segment: 'L3-L4', implant: 'cage' }] },
        points: l3l4Points,
      })
    ).body
    await submit(users.fellow, adjacent.id, 1)
    const both: TemplateOptions = {
      construct: [
        { segment: 'L3-L4', implant: 'cage' },
        { segment: 'L4-L5', implant: 'cage' },
      ],
    }
    const bothPoints = constructPoints(constructed, both)
    const res = await post(users.fellow, followUp, {
      template: 'construct-check',
      options: both,
      points: bothPoints,
    })
    expect(res.status).toBe(201)
    expect(res.body.results.subsidence['L4-L5'].baselineReadingId).toBe(early.id)
    expect(res.body.results.subsidence['L3-L4'].baselineReadingId).toBe(adjacent.id)
    expect(res.body.results.subsidenceBaselineReadingId).toBe(early.id)
  })

  it('refuses a construct check on a pre-op film', async () => {
    const preOpImage = await uploadFilm(
      neutral,
      'lateral-neutral',
      await visitOf('pre-op', '2026-02-10'),
    )
    const res = await post(users.fellow, preOpImage, {
      template: 'construct-check',
      options: { construct: [{ segment: 'L4-L5', implant: 'cage' }] },
    })
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/pre-op visit/)
    expect(await readingCount()).toBe(0)
  })
})

describe('implant centring on a frontal film', () => {
  const options: TemplateOptions = { discReplacements: ['L3-L4', 'L4-L5'] }
  const centringPoints = (film: Phantom): Points =>
    pick(
      film,
      templateLandmarks('implant-centring', options).map((spec) => spec.name),
    )

  it('measures each disc replacement from the ground truth and names the side from the file', async () => {
    const visit = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-10', 'post-op')
    const imageId = await uploadFilm(frontal, 'ap', visit)
    const res = await post(users.fellow, imageId, {
      template: 'implant-centring',
      options,
      points: centringPoints(frontal),
    })
    expect(res.status).toBe(201)
    const measured = res.body.results.measurements.frontal
    // The phantom was drawn with these offsets and tilt along the mean endplate direction.
    expect(measured['L4-L5'].lateralOffsetMm).toBeCloseTo(2.6, 6)
    expect(measured['L4-L5'].implantTiltDeg).toBeCloseTo(4, 6)
    expect(measured['L3-L4'].lateralOffsetMm).toBeCloseTo(-1, 6)
    // Both offsets are within 3 mm (McAfee et al. 2005, from memory, verify): not flagged.
    expect(res.body.results.centring).toMatchObject({
      thresholdMm: 3,
      imageRightSide: 'patient-left',
      segments: { 'L3-L4': { offCentre: false }, 'L4-L5': { offCentre: false } },
    })
    // Intervals come from the same propagation as the lateral measures.
    const interval = res.body.results.uncertainty.measurements.frontal['L4-L5'].lateralOffsetMm
    expect(interval.standardDeviation).toBeGreaterThan(0)
    expect((await submit(users.fellow, res.body.id, 1)).status).toBe(200)
    const image = await request(app)
      .get(`/api/images/${imageId}`)
      .set('Cookie', users.fellow.cookie)
    expect(image.body.dicom.patientOrientation).toEqual(['L', 'F'])
  })

  it('flags an off-centre implant at the site threshold and records the threshold used', async () => {
    // The phantom's L4-L5 implant sits 2.6 mm off the midline, L3-L4's 1 mm (its ground truth).
    await db(TABLES.siteSettings).insert({
      key: 'implantCentringThresholdMm',
      value: JSON.stringify(2),
    })
    const visit = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-10', 'post-op')
    const imageId = await uploadFilm(frontal, 'ap', visit)
    const res = await post(users.fellow, imageId, {
      template: 'implant-centring',
      options,
      points: centringPoints(frontal),
    })
    expect(res.status).toBe(201)
    expect(res.body.results.centring).toMatchObject({
      thresholdMm: 2,
      segments: { 'L3-L4': { offCentre: false }, 'L4-L5': { offCentre: true } },
    })
    expect(res.body.results.computedWith.implantCentringThresholdMm).toBe(2)
  })

  it('submits without the optional spinous processes, not without an implant end', async () => {
    const visit = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-10', 'post-op')
    const imageId = await uploadFilm(frontal, 'ap', visit)
    const { 'L3.sp': _a, 'L4.sp': _b, ...withoutSpinous } = centringPoints(frontal)
    const { 'tdr.L4-L5.r': _c, ...withoutEnd } = withoutSpinous
    const incomplete = await post(users.fellow, imageId, {
      template: 'implant-centring',
      options,
      points: withoutEnd,
    })
    const refused = await submit(users.fellow, incomplete.body.id, 1)
    expect(refused.status).toBe(400)
    expect(refused.body.error.message).toBe(
      'Place 1 required landmark before submitting: Disc replacement L4-L5, image-right end.',
    )
    const complete = await post(users.fellow, imageId, {
      template: 'implant-centring',
      options,
      points: withoutSpinous,
    })
    expect(complete.body.results.measurements.frontal['L4-L5'].rotationPercent).toBeNull()
    expect((await submit(users.fellow, complete.body.id, 1)).status).toBe(200)
  })

  it('refuses implant centring on a lateral or pre-op film, and a lateral template on an AP film', async () => {
    const postOp = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-10', 'post-op')
    const preOp = await insertTestVisit(db, patientId, users.fellow.id, '2026-02-10', 'pre-op')
    const lateralId = await uploadFilm(neutral, 'lateral-neutral', postOp)
    const apId = await uploadFilm(frontal, 'ap', postOp)
    const apPreOp = await uploadFilm(frontal, 'ap', preOp)
    const cases: Array<[number, object, RegExp]> = [
      [lateralId, { template: 'implant-centring', options }, /frontal \(AP\) film/],
      [apPreOp, { template: 'implant-centring', options }, /after surgery/],
      [apId, { template: 'slip-grade', options: { segment: 'L4-L5' } }, /reads a lateral film/],
      [apId, { template: 'implant-centring', options: {} }, /discReplacements/],
      [
        apId,
        { template: 'implant-centring', options: { discReplacements: ['L4-L5', 'L4-L5'] } },
        /twice/,
      ],
    ]
    for (const [imageId, body, message] of cases) {
      const res = await post(users.fellow, imageId, body)
      expect(res.status).toBe(400)
      expect(res.body.error.message).toMatch(message)
    }
    expect(await readingCount()).toBe(0)
  })
})

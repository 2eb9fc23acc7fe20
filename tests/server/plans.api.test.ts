import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { PhantomParamsInput } from '../../server/phantom/phantom-params'
import { SOURCES } from '../../shared/measurement/sources'
import type { TemplateOptions } from '../../shared/readings/templates'
import type { ReadingTemplate, Role } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import type { PatientPlan, PlanSegment } from '../../shared/types/plans'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { readPhantomAt, uploadPhantomFilm } from '../support/api-films'

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let patientId: number
let visitId: number
let slipFilm: Phantom

// An invented isthmic-looking slip of 38 % at L5-S1: Meyerding grade II (26–50 %).
const SLIP: PhantomParamsInput = { segments: { 'L5-S1': { slipPercent: 38 } } }

const NOTHING_RECORDED = {
  parsDefectLeft: false,
  parsDefectRight: false,
  facetDegeneration: false,
  dynamicInstability: false,
  treatment: 'none',
  implantLordosisDeg: null,
  implantHeightMm: null,
  notes: null,
  version: null,
}

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-plans-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  slipFilm = await smallPhantomFiles(SLIP)
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
  patientId = await insertTestPatient(db, users.fellow.id)
  visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-02', 'pre-op')
  await insertStudyWith(db, users.researcher.id, [patientId])
})

const getPlan = (who: TestUser = users.surgeon) =>
  request(app).get(`/api/patients/${patientId}/plan`).set('Cookie', who.cookie)
const putSegment = (segment: string, body: object, who: TestUser = users.surgeon) =>
  request(app)
    .put(`/api/patients/${patientId}/plan/${segment}`)
    .set('Cookie', who.cookie)
    .send({ ...NOTHING_RECORDED, ...body })
const segmentOf = (plan: PatientPlan, segment: string): PlanSegment =>
  plan.segments.find((s) => s.segment === segment) as PlanSegment
const checkOf = (segment: PlanSegment, id: string) => segment.checks.find((c) => c.id === id)
const planRows = async () =>
  Number(((await db(TABLES.planSegments).count({ n: '*' })) as [{ n: number }])[0].n)

/** Angle in degrees between two endplate lines drawn posterior → anterior (unoriented, < 90°). */
function lineAngleDeg(p1: PixelPoint, a1: PixelPoint, p2: PixelPoint, a2: PixelPoint): number {
  const t1 = Math.atan2(a1[1] - p1[1], a1[0] - p1[0])
  const t2 = Math.atan2(a2[1] - p2[1], a2[0] - p2[0])
  let d = Math.abs(t1 - t2) % Math.PI
  if (d > Math.PI / 2) d = Math.PI - d
  return (d * 180) / Math.PI
}

describe('GET /api/patients/:id/plan', () => {
  it('lists all five segments, never saved, with findings not recorded (null) and no checks', async () => {
    const res = await getPlan()
    expect(res.status).toBe(200)
    const plan = res.body as PatientPlan
    expect(plan.segments.map((s) => s.segment)).toEqual([
      'L1-L2',
      'L2-L3',
      'L3-L4',
      'L4-L5',
      'L5-S1',
    ])
    for (const segment of plan.segments) {
      expect(segment).toMatchObject({
        version: null,
        treatment: 'none',
        parsDefectLeft: null,
        facetDegeneration: null,
        checks: [],
      })
      expect(segment.evidence.slipPercent).toBeNull()
    }
    expect(plan.lordosis).toMatchObject({
      expectedLordosisDeg: null,
      targetLordosisDeg: null,
      isEstimate: true,
    })
    expect(plan.evidenceNote).toMatch(/submitted or signed/)
  })

  it('lets a researcher of the study read the plan without save times, and refuses the administrator', async () => {
    await putSegment('L4-L5', { treatment: 'decompression' })
    const researcher = await getPlan(users.researcher)
    expect(researcher.status).toBe(200)
    expect(segmentOf(researcher.body, 'L4-L5')).toMatchObject({
      treatment: 'decompression',
      version: 1,
      updatedAt: null,
    })
    expect(segmentOf((await getPlan()).body, 'L4-L5').updatedAt).toMatch(/^\d{4}-/)
    expect((await getPlan(users.fellow)).status).toBe(200)
    const admin = await getPlan(users.admin)
    expect(admin.status).toBe(403)
  })

  it('clears free-text notes for a researcher, as a visit indication is cleared', async () => {
    // An invented note holding the kinds of identity a clinician may type: name, record number, birth date.
    const note = 'Ada Invented, MRN 4711-0815, born 1961-04-12: discussed risks'
    expect((await putSegment('L4-L5', { treatment: 'decompression', notes: note })).status).toBe(
      200,
    )
    const surgeon = await getPlan()
    expect(segmentOf(surgeon.body, 'L4-L5').notes).toBe(note)
    const researcher = await getPlan(users.researcher)
    expect(researcher.status).toBe(200)
    expect(segmentOf(researcher.body, 'L4-L5').notes).toBeNull()
    expect(JSON.stringify(researcher.body)).not.toMatch(/Ada|4711|1961/)
  })

  it("answers 404 for a patient outside the researcher's studies", async () => {
    const other = await insertTestPatient(db, users.fellow.id)
    const res = await request(app)
      .get(`/api/patients/${other}/plan`)
      .set('Cookie', users.researcher.cookie)
    expect(res.status).toBe(404)
  })
})

describe('PUT /api/patients/:id/plan/:segment', () => {
  it('creates a segment, then updates it from its version, writing one audit event each', async () => {
    const created = await putSegment('L4-L5', {
      treatment: 'interbody-fusion',
      implantLordosisDeg: 12,
      implantHeightMm: 11,
      notes: ' Cage from the left. ',
    })
    expect(created.status).toBe(200)
    const first = segmentOf(created.body, 'L4-L5')
    expect(first).toMatchObject({
      version: 1,
      treatment: 'interbody-fusion',
      implantLordosisDeg: 12,
      implantHeightMm: 11,
      notes: 'Cage from the left.',
      parsDefectLeft: false,
    })
    const updated = await putSegment('L4-L5', {
      treatment: 'posterior-fusion',
      implantLordosisDeg: 10,
      version: 1,
    })
    expect(updated.status).toBe(200)
    expect(segmentOf(updated.body, 'L4-L5')).toMatchObject({
      version: 2,
      treatment: 'posterior-fusion',
      implantLordosisDeg: 10,
    })
    const row = await db(TABLES.planSegments)
      .where({ patient_id: patientId, segment: 'L4-L5' })
      .first()
    expect(row).toMatchObject({
      treatment: 'posterior-fusion',
      version: 2,
      updated_by: users.surgeon.id,
    })
    const events = await db(TABLES.auditEvents).where({ entity: 'plan-segment' }).orderBy('id')
    expect(events.map((e) => e.action)).toEqual(['create', 'update'])
    expect(events[1].entity_id).toBe(`${patientId}:L4-L5`)
  })

  it('answers 409 on a stale version and leaves the saved row untouched', async () => {
    await putSegment('L3-L4', { treatment: 'disc-replacement' })
    expect((await putSegment('L3-L4', { treatment: 'decompression', version: 1 })).status).toBe(200)
    const stale = await putSegment('L3-L4', { treatment: 'none', version: 1 })
    expect(stale.status).toBe(409)
    expect(stale.body.error.code).toBe('conflict')
    expect(stale.body.error.details.version[0]).toMatch(/current version is 2/)
    const row = await db(TABLES.planSegments)
      .where({ patient_id: patientId, segment: 'L3-L4' })
      .first()
    expect(row).toMatchObject({ treatment: 'decompression', version: 2 })
  })

  it('answers 409 when a row appeared since the plan was read (version null twice)', async () => {
    expect((await putSegment('L5-S1', { treatment: 'interbody-fusion' })).status).toBe(200)
    const again = await putSegment('L5-S1', { treatment: 'disc-replacement' })
    expect(again.status).toBe(409)
    expect((await db(TABLES.planSegments).where({ segment: 'L5-S1' }).first()).treatment).toBe(
      'interbody-fusion',
    )
  })

  it('lets only one of two simultaneous first saves through; the other is a 409', async () => {
    const [a, b] = await Promise.all([
      putSegment('L2-L3', { treatment: 'decompression' }),
      putSegment('L2-L3', { treatment: 'interbody-fusion' }),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    expect(await planRows()).toBe(1)
  })

  it('answers 409 when a version is sent for a segment that was never saved', async () => {
    const res = await putSegment('L1-L2', { version: 3 })
    expect(res.status).toBe(409)
    expect(await planRows()).toBe(0)
  })

  it('is for surgeons only: fellows and researchers get 403 and nothing is written', async () => {
    expect((await putSegment('L4-L5', {}, users.fellow)).status).toBe(403)
    expect((await putSegment('L4-L5', {}, users.researcher)).status).toBe(403)
    expect((await putSegment('L4-L5', {}, users.admin)).status).toBe(403)
    expect(await planRows()).toBe(0)
  })

  const INVALID: Array<[string, string, object, string]> = [
    ['an unknown segment', 'L6-S1', {}, 'segment'],
    ['an unknown treatment', 'L4-L5', { treatment: 'fusion' }, 'treatment'],
    [
      'an implant angle above 30°',
      'L4-L5',
      { treatment: 'interbody-fusion', implantLordosisDeg: 31 },
      'implantLordosisDeg',
    ],
    [
      'a negative implant angle',
      'L4-L5',
      { treatment: 'interbody-fusion', implantLordosisDeg: -1 },
      'implantLordosisDeg',
    ],
    [
      'an implant height below 4 mm',
      'L4-L5',
      { treatment: 'disc-replacement', implantHeightMm: 3.5 },
      'implantHeightMm',
    ],
    [
      'an implant height above 20 mm',
      'L4-L5',
      { treatment: 'disc-replacement', implantHeightMm: 21 },
      'implantHeightMm',
    ],
    [
      'an implant angle for a decompression',
      'L4-L5',
      { treatment: 'decompression', implantLordosisDeg: 8 },
      'implantLordosisDeg',
    ],
    [
      'an implant height with no treatment',
      'L4-L5',
      { treatment: 'none', implantHeightMm: 10 },
      'implantHeightMm',
    ],
    ['a finding that is not true or false', 'L4-L5', { parsDefectLeft: 'yes' }, 'parsDefectLeft'],
    ['a missing finding', 'L4-L5', { facetDegeneration: undefined }, 'facetDegeneration'],
    ['notes over 1000 characters', 'L4-L5', { notes: 'x'.repeat(1001) }, 'notes'],
    ['a version that is not a number', 'L4-L5', { version: 'latest' }, 'version'],
    ['an unknown field', 'L4-L5', { cageBrand: 'any' }, 'body'],
  ]
  for (const [what, segment, body, field] of INVALID) {
    it(`answers 400 naming ${field} for ${what}, writing nothing`, async () => {
      const res = await putSegment(segment, body)
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('validation_failed')
      expect(res.body.error.details[field]?.[0]).toMatch(new RegExp(`^${field}: `))
      expect(await planRows()).toBe(0)
    })
  }
})

describe('plan checks from real readings', () => {
  it('flags a disc replacement at a Meyerding II slip with its source and the reading it came from', async () => {
    const imageId = await uploadFilm(slipFilm)
    const reading = await readAt(slipFilm, imageId, 'slip-grade', { segment: 'L5-S1' })
    const res = await putSegment('L5-S1', {
      treatment: 'disc-replacement',
      implantLordosisDeg: 10,
      implantHeightMm: 12,
    })
    expect(res.status).toBe(200)
    const segment = segmentOf(res.body, 'L5-S1')
    // Meyerding grade II is 26–50 % (Meyerding 1932, as tabulated by Butt & Saifuddin 2005).
    expect(segment.evidence.slipPercent?.value).toBeCloseTo(38, 0)
    expect(segment.evidence.slipPercent).toMatchObject({
      readingId: reading.id,
      template: 'slip-grade',
      status: 'submitted',
      visitKind: 'pre-op',
    })
    expect(segment.evidence.meyerdingGrade?.value).toBe('II')
    expect(checkOf(segment, 'slip-grade-ii-or-more')).toMatchObject({
      flagged: true,
      source: SOURCES.slipGrade,
    })
    // Recorded as absent: false, not null.
    expect(checkOf(segment, 'pars-defect')?.flagged).toBe(false)
    expect(checkOf(segment, 'facet-degeneration')?.flagged).toBe(false)
    // The test patient has no osteoporosis recorded as false on the patient record.
    expect(checkOf(segment, 'osteoporosis')?.flagged).toBe(false)
    // No motion pair was read: unknown, never "passes".
    expect(checkOf(segment, 'dynamic-translation-over-5mm')?.flagged).toBeNull()
    // The phantom's calibrated disc is far above 3 mm.
    expect(segment.evidence.residualDiscHeightMm?.calibrationSource).toBe('dicom-pixel-spacing')
    expect(checkOf(segment, 'residual-disc-height-under-3mm')?.flagged).toBe(false)
  })

  it('flags a pars defect recorded on either side, and osteoporosis from the patient record', async () => {
    await db(TABLES.patients).where({ id: patientId }).update({ osteoporosis: true })
    const res = await putSegment('L4-L5', { treatment: 'disc-replacement', parsDefectRight: true })
    const segment = segmentOf(res.body, 'L4-L5')
    expect(checkOf(segment, 'pars-defect')).toMatchObject({
      flagged: true,
      source: SOURCES.parsDefect,
    })
    expect(checkOf(segment, 'osteoporosis')?.flagged).toBe(true)
    expect(segment.recordedInstability?.flagged).toBe(false)
  })

  it('flags instability recorded on dynamic films at a disc replacement, as common practice', async () => {
    const res = await putSegment('L4-L5', {
      treatment: 'disc-replacement',
      dynamicInstability: true,
    })
    const segment = segmentOf(res.body, 'L4-L5')
    // Common practice (no published threshold): a disc replacement needs a stable segment.
    expect(segment.recordedInstability).toMatchObject({
      flagged: true,
      source: expect.stringMatching(/^common practice/),
    })
    // The measured criterion stays unknown without a motion-pair reading.
    expect(checkOf(segment, 'dynamic-translation-over-5mm')?.flagged).toBeNull()
    const fused = await putSegment('L4-L5', {
      treatment: 'interbody-fusion',
      dynamicInstability: true,
      version: 1,
    })
    expect(segmentOf(fused.body, 'L4-L5').recordedInstability).toBeNull()
  })

  it('leaves measured checks unknown (null, not false) when nothing measured the segment', async () => {
    const res = await putSegment('L3-L4', { treatment: 'disc-replacement' })
    const segment = segmentOf(res.body, 'L3-L4')
    for (const id of [
      'slip-grade-ii-or-more',
      'dynamic-translation-over-5mm',
      'residual-disc-height-under-3mm',
    ]) {
      expect(checkOf(segment, id)?.flagged).toBeNull()
    }
  })

  it('never draws evidence from a draft or from a post-op visit', async () => {
    const imageId = await uploadFilm(slipFilm)
    await readAt(slipFilm, imageId, 'slip-grade', { segment: 'L5-S1' }, false)
    const later = await insertTestVisit(db, patientId, users.fellow.id, '2026-04-02', 'post-op')
    visitId = later
    const postOpImage = await uploadFilm(slipFilm)
    await readAt(slipFilm, postOpImage, 'slip-grade', { segment: 'L5-S1' })
    const res = await putSegment('L5-S1', { treatment: 'disc-replacement' })
    const segment = segmentOf(res.body, 'L5-S1')
    expect(segment.evidence.slipPercent).toBeNull()
    expect(checkOf(segment, 'slip-grade-ii-or-more')?.flagged).toBeNull()
  })

  it('shows where a planned disc replacement sits after surgery, lateral and frontal, from submitted readings only', async () => {
    // Invented post-op films of one disc replacement at L4-L5: its marker at 46 % of the
    // endplate depth on the lateral film; on the AP film 3.6 mm toward the image's right (the
    // patient's left), tilted 2°.
    const implant = { kind: 'disc-replacement' as const, segment: 'L4-L5' as const }
    const lateral = await smallPhantomFiles({ implants: [{ ...implant, positionPercent: 46 }] })
    const ap = await smallPhantomFiles({
      view: 'ap',
      seriesDescription: 'LUMBAR SPINE AP',
      widthPx: 625,
      heightPx: 750,
      implants: [{ ...implant, lateralOffsetMm: 3.6, coronalTiltDeg: 2 }],
    })
    visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-04-02', 'post-op')
    const construct: TemplateOptions = {
      construct: [{ segment: 'L4-L5', implant: 'disc-replacement' }],
    }
    const lateralReading = await readAt(
      lateral,
      await uploadFilm(lateral),
      'construct-check',
      construct,
    )
    const apImage = await uploadPhantomFilm(app, users.fellow.cookie, visitId, ap, 'ap')
    const centring = { discReplacements: ['L4-L5' as const] }
    const frontalReading = await readAt(ap, apImage, 'implant-centring', centring)
    // A later draft on the same film is never used.
    await readAt(ap, apImage, 'implant-centring', centring, false)

    const res = await putSegment('L4-L5', { treatment: 'disc-replacement' })
    const position = segmentOf(res.body, 'L4-L5').implantPosition!
    // Position along the endplate: 100·((marker − W.ps)·a)/|W.as − W.ps| (derived).
    expect(position.lateralPositionPercent).toMatchObject({ readingId: lateralReading.id })
    expect(position.lateralPositionPercent!.value).toBeCloseTo(46, 6)
    expect(position.frontal).toMatchObject({
      readingId: frontalReading.id,
      template: 'implant-centring',
      calibrationSource: 'dicom-pixel-spacing',
    })
    expect(position.frontal!.value.lateralOffsetMm).toBeCloseTo(3.6, 6)
    expect(position.frontal!.value.implantTiltDeg).toBeCloseTo(2, 6)
    // 3.6 mm is above the 3 mm threshold (McAfee et al. 2005, from memory, verify).
    expect(position.frontal!.value).toMatchObject({
      offCentre: true,
      thresholdMm: 3,
      imageRightSide: 'patient-left',
    })
    expect(position.frontalSource).toBe(SOURCES.frontalOffset)
    // Other treatments carry no implant position.
    expect(segmentOf(res.body, 'L3-L4').implantPosition).toBeNull()
  })

  it("gives the fused plan's expected lordosis and the PI target as hand arithmetic predicts", async () => {
    const imageId = await uploadFilm(slipFilm)
    const { id, points } = await readAt(slipFilm, imageId, 'lumbar-alignment', {})
    await putSegment('L5-S1', {
      treatment: 'interbody-fusion',
      implantLordosisDeg: 15,
      implantHeightMm: 12,
    })
    // A disc replacement keeps motion: the estimate leaves its angle out.
    await putSegment('L4-L5', { treatment: 'disc-replacement', implantLordosisDeg: 6 })
    const plan = (await getPlan()).body as PatientPlan
    const p = (name: string) => points[name] as PixelPoint
    // Cobb angles between endplate lines (Polly et al. 1996 for L1–S1; Cobb method per segment).
    const lumbar = lineAngleDeg(p('L1.ps'), p('L1.as'), p('S1.ps'), p('S1.as'))
    const l5s1 = lineAngleDeg(p('L5.ps'), p('L5.as'), p('S1.ps'), p('S1.as'))
    // Pelvic incidence (Legaye et al. 1998): angle between the S1 endplate's perpendicular at its
    // midpoint and the line from that midpoint to the hip axis (midway between the heads).
    const mid: PixelPoint = [
      (p('S1.as')[0] + p('S1.ps')[0]) / 2,
      (p('S1.as')[1] + p('S1.ps')[1]) / 2,
    ]
    const hip: PixelPoint = [(p('FH1')[0] + p('FH2')[0]) / 2, (p('FH1')[1] + p('FH2')[1]) / 2]
    const e = [p('S1.as')[0] - p('S1.ps')[0], p('S1.as')[1] - p('S1.ps')[1]] as const
    const v = [hip[0] - mid[0], hip[1] - mid[1]] as const
    const cosToEndplate =
      Math.abs(e[0] * v[0] + e[1] * v[1]) / (Math.hypot(...e) * Math.hypot(...v))
    const pi = 90 - (Math.acos(cosToEndplate) * 180) / Math.PI
    const segment = segmentOf(plan, 'L5-S1')
    expect(segment.evidence.currentSegmentalLordosisDeg?.value).toBeCloseTo(l5s1, 1)
    expect(plan.lordosis.currentLordosisDeg).toMatchObject({
      readingId: id,
      template: 'lumbar-alignment',
    })
    expect(plan.lordosis.currentLordosisDeg?.value).toBeCloseTo(lumbar, 1)
    expect(plan.lordosis.pelvicIncidenceDeg?.value).toBeCloseTo(pi, 1)
    // current + Σ(implant − current segmental) over fused segments (measurement-reference §9).
    expect(plan.lordosis.expectedLordosisDeg).toBeCloseTo(lumbar + 15 - l5s1, 1)
    // Target 0.54·PI + 27.6 (Le Huec & Hasegawa 2016, Eur Spine J 25:3630).
    expect(plan.lordosis.targetLordosisDeg).toBeCloseTo(0.54 * pi + 27.6, 1)
    expect(plan.lordosis.plannedMismatchDeg).toBeCloseTo(pi - (lumbar + 15 - l5s1), 1)
    expect(plan.lordosis.isEstimate).toBe(true)
  })
})

const uploadFilm = (film: Phantom) => uploadPhantomFilm(app, users.fellow.cookie, visitId, film)
const readAt = (
  film: Phantom,
  imageId: number,
  template: ReadingTemplate,
  options: TemplateOptions,
  submit = true,
) => readPhantomAt(app, users.fellow.cookie, film, imageId, template, options, submit)

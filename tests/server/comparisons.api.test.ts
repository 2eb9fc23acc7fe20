import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { findReading, signSubmittedReading } from '../../server/db/readings'
import { insertVisit } from '../../server/db/visits'
import type { PhantomParamsInput } from '../../server/phantom/phantom-params'
import { flexionExtensionPair } from '../../server/phantom/motion-pair'
import { templateLandmarks } from '../../shared/readings/templates'
import type { PixelPoint } from '../../shared/types/landmarks'
import { computeMeasurements } from '../../shared/measurement'
import type { Comparison, DifferenceRow } from '../../shared/types/compare'
import type { Role, VisitKind } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { readPhantomAt, uploadPhantomFilm } from '../support/api-films'

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

// Invented course: before surgery L4-L5 has 19° of segmental lordosis and a 12 % slip; after an
// interbody fusion with a 10° cage it has 27° (a known gain of 8°) and 3 %.
const PRE_OP: PhantomParamsInput = {
  segments: { 'L4-L5': { segmentalAngleDeg: 19, slipPercent: 12, posteriorDiscHeightMm: 5 } },
}
const POST_OP: PhantomParamsInput = {
  segments: { 'L4-L5': { segmentalAngleDeg: 27, slipPercent: 3, posteriorDiscHeightMm: 8 } },
}
const GAIN_DEG = 8

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let patientId: number
let visits: Record<VisitKind, number>
let preOpFilm: Phantom
let postOpFilm: Phantom

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-compare-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  preOpFilm = await smallPhantomFiles(PRE_OP)
  postOpFilm = await smallPhantomFiles(POST_OP)
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
  patientId = await insertTestPatient(db, users.fellow.id, {
    familyName: 'Vantongeren',
    givenName: 'Maelis',
    recordNumber: 'CMP-77120',
    birthDate: '1961-08-23',
  })
  const visit = (visitDate: string, kind: VisitKind, monthsSinceSurgery: number | null) =>
    insertVisit(db, {
      patientId,
      visitDate,
      kind,
      monthsSinceSurgery,
      indication: null,
      createdBy: users.fellow.id,
    })
  visits = {
    'pre-op': await visit('2026-01-12', 'pre-op', null),
    'post-op': await visit('2026-02-20', 'post-op', null),
    'follow-up': await visit('2026-08-20', 'follow-up', 6),
  }
  await insertStudyWith(db, users.researcher.id, [patientId])
})

const compare = (query: string, who: TestUser = users.surgeon) =>
  request(app).get(`/api/comparisons?${query}`).set('Cookie', who.cookie)
const rowOf = (comparison: Comparison, id: string) =>
  comparison.table.rows.find((row) => row.id === id) as DifferenceRow

async function filmsWithReadings() {
  const preOp = await uploadPhantomFilm(app, users.fellow.cookie, visits['pre-op'], preOpFilm)
  const postOp = await uploadPhantomFilm(app, users.fellow.cookie, visits['post-op'], postOpFilm)
  const before = await readPhantomAt(
    app,
    users.fellow.cookie,
    preOpFilm,
    preOp,
    'lumbar-alignment',
    {},
  )
  const after = await readPhantomAt(
    app,
    users.fellow.cookie,
    postOpFilm,
    postOp,
    'lumbar-alignment',
    {},
  )
  return { preOp, postOp, before, after }
}

describe('GET /api/comparisons', () => {
  it('shows the known lordosis gain within its combined interval, earlier film first', async () => {
    const { preOp, postOp, before, after } = await filmsWithReadings()
    // Asked in the other order: the pre-op film still comes first.
    const res = await compare(`images=${postOp},${preOp}`)
    expect(res.status).toBe(200)
    const comparison = res.body as Comparison
    expect(comparison.before.image.id).toBe(preOp)
    expect(comparison.after.image.id).toBe(postOp)
    expect(comparison.before.reading?.id).toBe(before.id)
    expect(comparison.after.reading?.id).toBe(after.id)
    expect(comparison.table.kind).toBe('pre-op-post-op')
    // Overlays are drawn from these landmarks on each side.
    expect(comparison.before.points).toEqual(before.points)
    expect(comparison.before.measures?.calibrationSource).toBe('dicom-pixel-spacing')

    const lordosis = rowOf(comparison, 'L4-L5-lordosis')
    expect(lordosis.unit).toBe('°')
    const change = lordosis.change!
    expect(Math.abs(change.value - GAIN_DEG)).toBeLessThanOrEqual(change.halfWidth95!)
    expect(change.value).toBeCloseTo(GAIN_DEG, 3)
    // The change's interval is both readings' 95 % intervals in quadrature; at σ = 1 mm an
    // angle between two endplates has an SD of roughly 3° (reference §8), so about ± 8° here.
    expect(change.halfWidth95).toBeCloseTo(
      Math.hypot(lordosis.before!.halfWidth95!, lordosis.after!.halfWidth95!),
      9,
    )
    expect(change.halfWidth95).toBeGreaterThan(3)
    expect(change.halfWidth95).toBeLessThan(15)
    expect(rowOf(comparison, 'L4-L5-slip').change?.value).toBeCloseTo(3 - 12, 2)
    const mean = rowOf(comparison, 'L4-L5-disc-mean')
    expect(mean.unit).toBe('mm')
    expect(mean.calibration).toEqual({
      before: 'dicom-pixel-spacing',
      after: 'dicom-pixel-spacing',
    })
    // Global rows from the two lumbar-alignment readings.
    const truthBefore = computeMeasurements(preOpFilm.film.landmarks)
    const truthAfter = computeMeasurements(postOpFilm.film.landmarks)
    expect(rowOf(comparison, 'lumbar-lordosis').change?.value).toBeCloseTo(
      truthAfter.lumbarLordosisDeg! - truthBefore.lumbarLordosisDeg!,
      3,
    )
    expect(rowOf(comparison, 'pi-ll').after?.value).toBeCloseTo(truthAfter.piLlMismatchDeg!, 3)
    expect(comparison.table.intervalMethod).toMatch(/quadrature/)
  })

  it('sets the planned implant and target lordosis beside what the post-op film achieved', async () => {
    const { preOp, postOp } = await filmsWithReadings()
    const saved = await request(app)
      .put(`/api/patients/${patientId}/plan/L4-L5`)
      .set('Cookie', users.surgeon.cookie)
      .send({
        parsDefectLeft: false,
        parsDefectRight: false,
        facetDegeneration: false,
        dynamicInstability: false,
        treatment: 'interbody-fusion',
        implantLordosisDeg: 10,
        implantHeightMm: 11,
        notes: null,
        version: null,
      })
    expect(saved.status).toBe(200)
    const comparison = (await compare(`images=${preOp},${postOp}`)).body as Comparison
    const byId = Object.fromEntries(comparison.table.plan.map((row) => [row.id, row]))
    expect(byId['L4-L5-implant-lordosis']).toMatchObject({
      planned: 10,
      plannedLabel: 'planned implant lordosis',
    })
    expect(byId['L4-L5-implant-lordosis']!.achieved?.value).toBeCloseTo(27, 3)
    expect(byId['L4-L5-implant-lordosis']!.differenceDeg).toBeCloseTo(17, 3)
    // Target from the pre-op pelvic incidence: 0.54·PI + 27.6 (Le Huec & Hasegawa 2016).
    const pi = computeMeasurements(preOpFilm.film.landmarks).pelvis!.incidenceDeg!
    expect(byId['target-lordosis']!.planned).toBeCloseTo(0.54 * pi + 27.6, 3)
    expect(byId['target-lordosis']!.achieved?.value).toBeCloseTo(
      computeMeasurements(postOpFilm.film.landmarks).lumbarLordosisDeg!,
      3,
    )
  })

  it('takes the signed reading of a film over a newer draft, and the reading asked for when given', async () => {
    const { preOp, postOp, after } = await filmsWithReadings()
    // Sign-off has no endpoint yet: the reading is signed through the repository, as the
    // sign-off service will do.
    const stored = await findReading(db, after.id)
    expect(await signSubmittedReading(db, after.id, stored!.version, users.surgeon.id)).toBe(true)
    const draft = await readPhantomAt(
      app,
      users.fellow.cookie,
      postOpFilm,
      postOp,
      'slip-grade',
      { segment: 'L4-L5' },
      false,
    )
    const current = (await compare(`images=${preOp},${postOp}`)).body as Comparison
    expect(current.after.reading).toMatchObject({ id: after.id, status: 'signed' })
    const asked = (await compare(`images=${preOp},${postOp}&readings=${draft.id}`))
      .body as Comparison
    expect(asked.after.reading).toMatchObject({ id: draft.id, status: 'draft' })
    expect(asked.table.segments).toEqual(['L4-L5'])
  })

  it('gives a researcher the study view: visit kinds and order, no dates', async () => {
    const { preOp, postOp } = await filmsWithReadings()
    const res = await compare(`images=${preOp},${postOp}`, users.researcher)
    expect(res.status).toBe(200)
    const comparison = res.body as Comparison
    expect(comparison.before.visit).toMatchObject({
      kind: 'deidentified',
      sequence: 1,
      visitKind: 'pre-op',
    })
    expect(comparison.after.reading?.createdAt).toBeNull()
    expect(comparison.after.image.createdAt).toBeNull()
    expect(JSON.stringify(res.body)).not.toMatch(/2026-0[128]-\d\d|Vantongeren|CMP-77120|1961/)
  })

  it('audits the comparison for clinical roles', async () => {
    const { preOp, postOp } = await filmsWithReadings()
    await compare(`images=${preOp},${postOp}`)
    const events = await db(TABLES.auditEvents).where({ entity: 'patient', action: 'view' })
    expect(events.map((event) => event.summary)).toContain(
      `Compared films ${preOp} and ${postOp} of patient ${(await db(TABLES.patients).where({ id: patientId }).first()).study_code}`,
    )
  })

  it('refuses bad input with a clear message and changes nothing', async () => {
    const { preOp, postOp } = await filmsWithReadings()
    const one = await compare(`images=${preOp}`)
    expect(one.status).toBe(400)
    expect(one.body.error.message).toMatch(/images: must name exactly 2 ids/)
    expect((await compare(`images=${preOp},${preOp}`)).status).toBe(400)
    expect((await compare('images=abc')).status).toBe(400)
    const otherPatient = await insertTestPatient(db, users.fellow.id)
    const otherVisit = await insertVisit(db, {
      patientId: otherPatient,
      visitDate: '2026-03-01',
      kind: 'pre-op',
      monthsSinceSurgery: null,
      indication: null,
      createdBy: users.fellow.id,
    })
    const foreign = await uploadPhantomFilm(app, users.fellow.cookie, otherVisit, postOpFilm)
    const mixed = await compare(`images=${preOp},${foreign}`)
    expect(mixed.status).toBe(400)
    expect(mixed.body.error.message).toMatch(/different patients/)
    // The other patient is outside the researcher's study: not found, nothing said about it.
    expect((await compare(`images=${foreign},${postOp}`, users.researcher)).status).toBe(404)
    expect((await compare(`images=${preOp},${postOp}&readings=999999`)).status).toBe(400)
    // The administrator reads no patient data.
    expect((await compare(`images=${preOp},${postOp}`, users.admin)).status).toBe(403)
  })

  it('sets flexion against extension with the motion-pair reading on both films', async () => {
    // Invented dynamic films: 14° of motion and 12 % of translation at L4-L5 (server/phantom).
    const pair = flexionExtensionPair(
      { segments: { 'L4-L5': { slipPercent: 9 } } },
      { segment: 'L4-L5', angularRangeDeg: 14, translationPercent: 12 },
    )
    const upload = async (params: PhantomParamsInput, view: string) => {
      const files = await smallPhantomFiles(params)
      const res = await request(app)
        .post(`/api/visits/${visits['pre-op']}/images`)
        .set('Cookie', users.fellow.cookie)
        .field('view', view)
        .field('confirmPatientMismatch', 'true')
        .attach('file', files.dicom, `${view}.dcm`)
      expect(res.status).toBe(201)
      return { id: res.body[0].id as number, truth: files.film.landmarks.points }
    }
    const flexion = await upload(pair.flexion, 'lateral-flexion')
    const extension = await upload(pair.extension, 'lateral-extension')
    const names = templateLandmarks('motion-pair', { segment: 'L4-L5' }).map((spec) => spec.name)
    const on = (truth: Record<string, PixelPoint>) =>
      Object.fromEntries(names.map((name) => [name, truth[name] as PixelPoint]))
    const created = await request(app)
      .post(`/api/images/${flexion.id}/readings`)
      .set('Cookie', users.fellow.cookie)
      .send({
        template: 'motion-pair',
        options: { segment: 'L4-L5' },
        pairedImageId: extension.id,
        points: on(flexion.truth),
      })
    expect(created.status).toBe(201)
    const saved = await request(app)
      .patch(`/api/readings/${created.body.id}`)
      .set('Cookie', users.fellow.cookie)
      .send({
        points: on(flexion.truth),
        pairedPoints: on(extension.truth),
        version: created.body.version,
      })
    expect(saved.status).toBe(200)

    const comparison = (await compare(`images=${extension.id},${flexion.id}`)).body as Comparison
    expect(comparison.table.kind).toBe('flexion-extension')
    expect(comparison.before).toMatchObject({ side: 'primary', image: { id: flexion.id } })
    expect(comparison.after).toMatchObject({ side: 'paired', image: { id: extension.id } })
    expect(comparison.after.points).toEqual(on(extension.truth))
    // The extension film's own measures, with intervals, computed from the stored landmarks.
    const lordosis = rowOf(comparison, 'L4-L5-lordosis')
    expect(lordosis.change?.value).toBeCloseTo(14, 3)
    expect(lordosis.after?.halfWidth95).toBeGreaterThan(0)
    expect(rowOf(comparison, 'L4-L5-slip').change?.value).toBeCloseTo(-12, 3)
    // Motion as the reading stored it (reference §6), once although both films carry the reading.
    expect(comparison.table.motion).toHaveLength(1)
    expect(comparison.table.motion[0]).toMatchObject({
      readingId: created.body.id,
      segment: 'L4-L5',
    })
    expect(comparison.table.motion[0]!.rangeOfMotionDeg).toBeCloseTo(14, 3)
    expect(comparison.table.plan).toEqual([])
  })

  it('sets the frontal films side by side: the implant offset and tilt changes within their intervals', async () => {
    // Invented course of a disc replacement at L4-L5 on the frontal film: 1.0 mm toward the
    // image's right with 2° of tilt after surgery, 3.5 mm and 6° at follow-up (phantom ground
    // truth, server/phantom); the header names the image's right edge as the patient's left.
    const apFilm = (lateralOffsetMm: number, coronalTiltDeg: number) =>
      smallPhantomFiles({
        view: 'ap',
        seriesDescription: 'LUMBAR SPINE AP',
        widthPx: 625,
        heightPx: 750,
        implants: [{ kind: 'disc-replacement', segment: 'L4-L5', lateralOffsetMm, coronalTiltDeg }],
      })
    const postOp = await apFilm(1, 2)
    const followUp = await apFilm(3.5, 6)
    const options = { discReplacements: ['L4-L5' as const] }
    const postOpId = await uploadPhantomFilm(
      app,
      users.fellow.cookie,
      visits['post-op'],
      postOp,
      'ap',
    )
    const followUpId = await uploadPhantomFilm(
      app,
      users.fellow.cookie,
      visits['follow-up'],
      followUp,
      'ap',
    )
    await readPhantomAt(app, users.fellow.cookie, postOp, postOpId, 'implant-centring', options)
    await readPhantomAt(app, users.fellow.cookie, followUp, followUpId, 'implant-centring', options)
    // A plan with a lordosis target at L4-L5: measured on lateral films only, never set beside
    // a frontal film.
    const planned = await request(app)
      .put(`/api/patients/${patientId}/plan/L4-L5`)
      .set('Cookie', users.surgeon.cookie)
      .send({
        parsDefectLeft: false,
        parsDefectRight: false,
        facetDegeneration: false,
        dynamicInstability: false,
        treatment: 'disc-replacement',
        implantLordosisDeg: 6,
        implantHeightMm: 10,
        notes: null,
        version: null,
      })
    expect(planned.status).toBe(200)

    const res = await compare(`images=${followUpId},${postOpId}`)
    expect(res.status).toBe(200)
    const comparison = res.body as Comparison
    expect(comparison.table.kind).toBe('follow-ups')
    expect(comparison.table.segments).toEqual([])
    expect(comparison.table.frontalSegments).toEqual(['L4-L5'])
    expect(comparison.table.plan).toEqual([])

    const offset = rowOf(comparison, 'L4-L5-frontal-offset-mm')
    expect(offset.unit).toBe('mm')
    expect(offset.before?.value).toBeCloseTo(1, 6)
    expect(offset.after?.value).toBeCloseTo(3.5, 6)
    const change = offset.change!
    expect(change.value).toBeCloseTo(2.5, 6)
    // Combined as the lateral rows are: the two 95 % half-widths in quadrature.
    expect(change.halfWidth95).toBeCloseTo(
      Math.hypot(offset.before!.halfWidth95!, offset.after!.halfWidth95!),
      9,
    )
    expect(change.halfWidth95).toBeGreaterThan(0)
    expect(offset.calibration).toEqual({
      before: 'dicom-pixel-spacing',
      after: 'dicom-pixel-spacing',
    })
    // % of the endplate width, against the engine on the phantom's own landmarks.
    const truthBefore = computeMeasurements(postOp.film.landmarks).frontal['L4-L5']!
    const truthAfter = computeMeasurements(followUp.film.landmarks).frontal['L4-L5']!
    expect(rowOf(comparison, 'L4-L5-frontal-offset-percent').change?.value).toBeCloseTo(
      truthAfter.lateralOffsetPercent! - truthBefore.lateralOffsetPercent!,
      6,
    )
    const tilt = rowOf(comparison, 'L4-L5-frontal-tilt')
    expect(tilt.unit).toBe('°')
    expect(tilt.change?.value).toBeCloseTo(4, 6)
    expect(tilt.change!.halfWidth95).toBeGreaterThan(0)
    const coronal = rowOf(comparison, 'L4-L5-frontal-coronal-angle')
    expect(coronal.change?.value).toBeCloseTo(
      truthAfter.segmentCoronalAngleDeg! - truthBefore.segmentCoronalAngleDeg!,
      6,
    )
    // How to read the sign, with the side the file names.
    expect(comparison.table.notes.join(' ')).toMatch(/positive toward the image's right edge/)
  })
})

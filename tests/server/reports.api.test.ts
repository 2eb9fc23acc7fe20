import { mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs'
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
import { phantomPreset } from '../../server/phantom/presets'
import { templateLandmarks } from '../../shared/readings/templates'
import type { PixelPoint } from '../../shared/types/landmarks'
import { computeMeasurements } from '../../shared/measurement'
import { REPORT_CAUTIONS } from '../../shared/reports/cautions'
import type { Role, VisitKind } from '../../shared/types/domain'
import type { Reading } from '../../shared/types/readings'
import type { ReadingReport, VisitReport } from '../../shared/types/reports'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { readPhantomAt, uploadPhantomFilm } from '../support/api-films'
import { pdfPageTexts } from '../support/pdf-text'
import { screenshotPath } from '../support/browser'

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

// Invented patient and course: a 38 % slip at L5-S1 (Meyerding II) and L4-L5 lordosis of 19°
// before surgery; after it 27° at L4-L5 (a gain of 8°) and 9 % at L5-S1.
const PATIENT = {
  familyName: 'Rautenstrauch',
  givenName: 'Ottilie',
  recordNumber: 'RPT-50391',
  birthDate: '1958-11-04',
}
const PRE_OP: PhantomParamsInput = {
  segments: { 'L5-S1': { slipPercent: 38 }, 'L4-L5': { segmentalAngleDeg: 19 } },
}
const POST_OP: PhantomParamsInput = {
  segments: { 'L5-S1': { slipPercent: 9 }, 'L4-L5': { segmentalAngleDeg: 27 } },
}
const VISIT_DATES = { 'pre-op': '2026-01-19', 'post-op': '2026-03-02', 'follow-up': '2026-09-07' }

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
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-reports-'))
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
  patientId = await insertTestPatient(db, users.fellow.id, PATIENT)
  const visit = (kind: VisitKind, months: number | null) =>
    insertVisit(db, {
      patientId,
      visitDate: VISIT_DATES[kind],
      kind,
      monthsSinceSurgery: months,
      indication: 'Invented indication: leg pain on walking',
      createdBy: users.fellow.id,
    })
  visits = {
    'pre-op': await visit('pre-op', null),
    'post-op': await visit('post-op', null),
    'follow-up': await visit('follow-up', 6),
  }
  await insertStudyWith(db, users.researcher.id, [patientId])
})

const pdf = (path: string, who: TestUser = users.surgeon) =>
  request(app)
    .get(path)
    .set('Cookie', who.cookie)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = []
      res.on('data', (chunk: Buffer) => chunks.push(chunk))
      res.on('end', () => done(null, Buffer.concat(chunks)))
    })

async function slipReading(submit = true) {
  const image = await uploadPhantomFilm(app, users.fellow.cookie, visits['pre-op'], preOpFilm)
  const reading = await readPhantomAt(
    app,
    users.fellow.cookie,
    preOpFilm,
    image,
    'slip-grade',
    { segment: 'L5-S1' },
    submit,
  )
  const stored = (
    await request(app).get(`/api/readings/${reading.id}`).set('Cookie', users.surgeon.cookie)
  ).body as Reading
  return { image, reading, stored }
}

/** Sign-off has no endpoint yet: the test signs through the repository, as its service will. */
async function signAsSurgeon(readingId: number): Promise<void> {
  const stored = await findReading(db, readingId)
  expect(await signSubmittedReading(db, readingId, stored!.version, users.surgeon.id)).toBe(true)
}

const oneDecimal = (value: number) => value.toFixed(1).replace('-', '−')

describe('GET /api/readings/:id/report.pdf', () => {
  it('holds the values with units and intervals, the grade and its probability, the signer and the cautions', async () => {
    const { reading, stored } = await slipReading()
    await signAsSurgeon(reading.id)
    const res = await pdf(`/api/readings/${reading.id}/report.pdf`)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    expect(res.headers['cache-control']).toBe('no-store')
    // Kept for a human look (tests/output is git-ignored).
    writeFileSync(screenshotPath('report-reading').replace(/\.png$/, '.pdf'), res.body as Buffer)
    const pages = await pdfPageTexts(res.body as Buffer)
    const text = pages.join('\n')
    expect(text).toContain('Endplate')
    expect(text).toContain('Reading report')
    expect(text).toContain('Rautenstrauch, Ottilie')
    expect(text).toContain('Record no. RPT-50391 · born 4 Nov 1958')
    expect(text).toContain('Pre-op · 19 Jan 2026')

    // The ground truth slip (Taillard, Butt & Saifuddin 2005) of the phantom, as the engine has it.
    const truth = computeMeasurements(preOpFilm.film.landmarks).segments['L5-S1']!
    const slip = stored.results.measurements.segments['L5-S1']!
    expect(slip.slipPercent).toBeCloseTo(truth.slipPercent!, 6)
    const slipInterval = stored.results.uncertainty!.measurements.segments['L5-S1']!.slipPercent!
    const halfWidth = (slipInterval.high - slipInterval.low) / 2
    expect(text).toMatch(
      new RegExp(`Slip ${oneDecimal(slip.slipPercent!)} % ± ${oneDecimal(halfWidth)} %`),
    )
    expect(text).toMatch(new RegExp(`Slip distance ${oneDecimal(slip.slipMm!)} mm ± \\d+\\.\\d mm`))
    expect(text).toMatch(/Segmental lordosis −?\d+\.\d° ± \d+\.\d°/)
    // 38 % is Meyerding grade II (26–50 %, Meyerding 1932); its probability beside it.
    expect(text).toMatch(/Meyerding grade Grade II P (\d+ %|> 99 %)/)
    expect(text.replace(/\s+/g, ' ')).toContain('DICOM spacing (in patient)')
    expect(text).toContain('Grade rule: slip rounded to 0.1 % (half up)')
    // The sign-off block: rater, status, signer.
    expect(text).toMatch(
      /Test fellow Signed \d+ \w{3} \d{4}, \d\d:\d\d UTC Test surgeon \d+ \w{3} \d{4}, \d\d:\d\d UTC/,
    )
    for (const caution of REPORT_CAUTIONS) expect(text.replace(/\n/g, ' ')).toContain(caution)
    // Page numbers on every page; a signed reading carries no stamp.
    pages.forEach((page, index) => expect(page).toContain(`Page ${index + 1} of ${pages.length}`))
    expect(text).not.toContain('NOT SIGNED')
  })

  it('stamps a draft on every page', async () => {
    const { reading } = await slipReading(false)
    const pages = await pdfPageTexts(
      (await pdf(`/api/readings/${reading.id}/report.pdf`)).body as Buffer,
    )
    expect(pages.length).toBeGreaterThan(0)
    for (const page of pages) expect(page).toContain('DRAFT · NOT SIGNED')
    expect(pages.join('\n')).toMatch(/Test fellow Draft — not signed —/)
  })

  it('gives a researcher a report without a name, record number or date', async () => {
    const { reading } = await slipReading()
    await signAsSurgeon(reading.id)
    const res = await pdf(`/api/readings/${reading.id}/report.pdf`, users.researcher)
    expect(res.status).toBe(200)
    writeFileSync(screenshotPath('report-researcher').replace(/\.png$/, '.pdf'), res.body as Buffer)
    const raw = (res.body as Buffer).toString('latin1')
    const text = (await pdfPageTexts(res.body as Buffer)).join('\n')
    const studyCode = (await db(TABLES.patients).where({ id: patientId }).first())
      .study_code as string
    expect(text).toContain(`Study code ${studyCode}`)
    expect(text).toMatch(/Age at visit \d+ y/)
    expect(text).toContain('Pre-op · visit 1')
    const identifying = [
      PATIENT.familyName,
      PATIENT.givenName,
      PATIENT.recordNumber,
      PATIENT.birthDate,
      '4 Nov 1958',
      '19581104',
      ...Object.values(VISIT_DATES),
      '19 Jan 2026',
      'Invented indication',
      // The phantom's DICOM header names its own invented patient.
      'PHANTOM',
      // Clinical copies say when they were made; a researcher's names no time at all.
      'UTC',
    ]
    for (const needle of identifying) {
      expect(text).not.toContain(needle)
      expect(raw).not.toContain(needle)
    }
    // The bare birth year is looked for in the pages' text only: the file's cross-reference
    // table and stream lengths are decimal byte counts, which hold any four digits by chance.
    expect(text).not.toContain('1958')
  })

  it('is audited for clinical roles, and refuses an unknown reading and the administrator', async () => {
    const { reading } = await slipReading()
    await pdf(`/api/readings/${reading.id}/report.pdf`)
    await pdf(`/api/readings/${reading.id}/report.pdf`, users.researcher)
    const events = await db(TABLES.auditEvents)
      .where({ entity: 'reading', action: 'view' })
      .where('summary', 'like', 'Viewed the PDF report%')
    expect(events.map((event) => [event.user_id, event.summary])).toEqual([
      [
        users.surgeon.id,
        expect.stringMatching(
          new RegExp(`^Viewed the PDF report of reading ${reading.id} of patient EP-`),
        ),
      ],
    ])
    // Every researcher read is audited too, once per request.
    const researcherReads = await db(TABLES.auditEvents).where({ user_id: users.researcher.id })
    expect(researcherReads.map((event) => event.summary)).toEqual([
      `Requested /api/readings/${reading.id}/report.pdf (researcher)`,
    ])
    expect((await pdf('/api/readings/999999/report.pdf')).status).toBe(404)
    expect((await pdf('/api/readings/abc/report.pdf')).status).toBe(400)
    expect((await pdf(`/api/readings/${reading.id}/report.pdf`, users.admin)).status).toBe(403)
  })

  it('answers the same content as JSON for the printable page', async () => {
    const { reading } = await slipReading()
    const res = await request(app)
      .get(`/api/readings/${reading.id}/report`)
      .set('Cookie', users.surgeon.cookie)
    expect(res.status).toBe(200)
    const report = res.body as ReadingReport
    expect(report.kind).toBe('reading')
    expect(report.stamp).toBe('NOT SIGNED')
    expect(report.cautions).toEqual(REPORT_CAUTIONS)
    const [part] = report.readings
    expect(part.films[0]?.shapes.some((shape) => shape.id === 'slip-L5-S1')).toBe(true)
    expect(part.tables[0]?.rows.find((row) => row.cells[0] === 'Slip')?.cells[1]).toMatch(
      /^\d+\.\d %$/,
    )
  })
})

describe('GET /api/visits/:id/report.pdf', () => {
  it('reports every reading of the visit and the changes against the previous visit', async () => {
    const preOp = await uploadPhantomFilm(app, users.fellow.cookie, visits['pre-op'], preOpFilm)
    const postOp = await uploadPhantomFilm(app, users.fellow.cookie, visits['post-op'], postOpFilm)
    await readPhantomAt(app, users.fellow.cookie, preOpFilm, preOp, 'lumbar-alignment', {})
    const after = await readPhantomAt(
      app,
      users.fellow.cookie,
      postOpFilm,
      postOp,
      'lumbar-alignment',
      {},
    )
    await signAsSurgeon(after.id)
    const res = await pdf(`/api/visits/${visits['post-op']}/report.pdf`)
    expect(res.status).toBe(200)
    writeFileSync(screenshotPath('report-visit').replace(/\.png$/, '.pdf'), res.body as Buffer)
    const text = (await pdfPageTexts(res.body as Buffer)).join('\n')
    expect(text).toContain('Visit report')
    expect(text).toContain(`Lumbar alignment · reading ${after.id}`)
    expect(text).toContain('Against the previous visit')
    // The known gain of 8° at L4-L5 with its combined interval.
    expect(text).toMatch(
      /L4-L5 · Segmental lordosis 19\.0° ± \d+\.\d° 27\.0° ± \d+\.\d° \+8\.0° ± \d+\.\d°/,
    )
    expect(text).toMatch(/L5-S1 · Slip 38\.0 % ± \d+\.\d % 9\.0 % ± \d+\.\d % −29\.0 % ± \d+\.\d %/)
    expect(text).toContain('add in quadrature')
    expect(text).not.toContain('NOT ALL READINGS SIGNED')

    const report = (
      await request(app)
        .get(`/api/visits/${visits['post-op']}/report`)
        .set('Cookie', users.surgeon.cookie)
    ).body as VisitReport
    expect(report.comparisons).toHaveLength(1)
    // The first visit has nothing before it.
    const first = (
      await request(app)
        .get(`/api/visits/${visits['pre-op']}/report`)
        .set('Cookie', users.surgeon.cookie)
    ).body as VisitReport
    expect(first.comparisons).toEqual([])
    expect(first.stamp).toBe('NOT ALL READINGS SIGNED')
  })

  it('reports a frontal implant-centring reading with its frontal overlays and results', async () => {
    // The demo's invented hybrid construct on its post-op AP film (server/phantom presets).
    const ap = await smallPhantomFiles({
      ...phantomPreset('hybrid-post-op-ap'),
      widthPx: 640,
      heightPx: 800,
    })
    const upload = await request(app)
      .post(`/api/visits/${visits['post-op']}/images`)
      .set('Cookie', users.fellow.cookie)
      .field('view', 'ap')
      .field('confirmPatientMismatch', 'true')
      .attach('file', ap.dicom, 'ap.dcm')
    expect(upload.status).toBe(201)
    const options = { discReplacements: ['L3-L4', 'L4-L5'] }
    const truth = ap.film.landmarks.points as Record<string, PixelPoint>
    const points = Object.fromEntries(
      templateLandmarks('implant-centring', options as never)
        .filter((spec) => truth[spec.name])
        .map((spec) => [spec.name, truth[spec.name]]),
    )
    const created = await request(app)
      .post(`/api/images/${upload.body[0].id}/readings`)
      .set('Cookie', users.fellow.cookie)
      .send({ template: 'implant-centring', options, points })
    expect(created.status).toBe(201)
    const res = await pdf(`/api/readings/${created.body.id}/report.pdf`)
    expect(res.status).toBe(200)
    writeFileSync(screenshotPath('report-frontal').replace(/\.png$/, '.pdf'), res.body as Buffer)
    const text = (await pdfPageTexts(res.body as Buffer)).join('\n')
    expect(text).toContain('Implant centring (AP)')
    // The overlay labels carry the engine's offsets with the patient's side, as the results do:
    // the file's Patient Orientation L\F makes the image's right edge the patient's left.
    expect(text).toMatch(/L3-L4 offset \d+\.\d mm \/ \d+\.\d % to patient right/)
    expect(text).toMatch(/L4-L5 offset \d+\.\d mm \/ \d+\.\d % to patient left/)
    expect(text).toMatch(/tilt \d+\.\d°/)
    expect(text).toContain('Offset from midline')
  })

  it('reports the frontal changes against the previous visit: offset, tilt and coronal angle', async () => {
    // Invented course of an L4-L5 disc replacement on the frontal film: 1.0 mm off the midline
    // and 2° of tilt after surgery, 3.5 mm and 6° at follow-up (phantom ground truth).
    const apFilm = (lateralOffsetMm: number, coronalTiltDeg: number) =>
      smallPhantomFiles({
        view: 'ap',
        seriesDescription: 'LUMBAR SPINE AP',
        widthPx: 625,
        heightPx: 750,
        implants: [{ kind: 'disc-replacement', segment: 'L4-L5', lateralOffsetMm, coronalTiltDeg }],
      })
    const options = { discReplacements: ['L4-L5' as const] }
    const postOp = await apFilm(1, 2)
    const followUp = await apFilm(3.5, 6)
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
    const res = await pdf(`/api/visits/${visits['follow-up']}/report.pdf`)
    expect(res.status).toBe(200)
    const text = (await pdfPageTexts(res.body as Buffer)).join('\n')
    expect(text).toContain('Against the previous visit')
    expect(text).toMatch(
      /L4-L5 · Implant lateral offset \(frontal\) 1\.0 mm ± \d+\.\d mm 3\.5 mm ± \d+\.\d mm \+2\.5 mm ± \d+\.\d mm/,
    )
    expect(text).toMatch(
      /L4-L5 · Implant coronal tilt \(frontal\) 2\.0° ± \d+\.\d° 6\.0° ± \d+\.\d° \+4\.0° ± \d+\.\d°/,
    )
    expect(text).toContain('Segment coronal angle (frontal)')
    expect(text).toMatch(/positive toward the image's right\s+edge/)
  })
})

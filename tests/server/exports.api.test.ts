import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import ExcelJS from 'exceljs'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { insertVisit } from '../../server/db/visits'
import type { Role } from '../../shared/types/domain'
import { MEASUREMENT_COLUMNS } from '../../server/exports/export-columns'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { readPhantomAt, uploadPhantomFilm } from '../support/api-films'
import { binaryParser, xlsxText } from '../support/download-bytes'

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let film: Phantom
let studyId: number
let slipReadingId: number

/** Identifying values of the seeded patients: none may reach a researcher. */
const IDENTITY = {
  familyName: 'Quenneville',
  givenName: 'Ottoline',
  recordNumber: 'MRN-778812',
  birthDate: '1961-04-23',
  outsiderName: 'Brackenridge',
  outsiderRecord: 'MRN-990017',
}
const VISIT_DATES = ['2026-01-10', '2026-03-01']

/** Parses our CSV (no quoted newlines in it): header row, then rows of raw cell texts. */
function parseCsv(text: string): { headers: string[]; rows: string[][] } {
  const lines = text
    .replace(/^\uFEFF/, '')
    .trimEnd()
    .split(/\r?\n/)
  const split = (line: string) =>
    (line.match(/("([^"]|"")*"|[^,]*)(,|$)/g) ?? []).slice(0, -1).map((cell) =>
      cell
        .replace(/,$/, '')
        .replace(/^"(.*)"$/, '$1')
        .replace(/""/g, '"'),
    )
  const [header, ...rest] = lines
  return { headers: split(header ?? ''), rows: rest.map(split) }
}

const columnIndex = (headers: string[], header: string) => {
  const index = headers.indexOf(header)
  if (index < 0) throw new Error(`no column ${header}`)
  return index
}

async function download(user: TestUser, path: string) {
  return request(app).get(path).set('Cookie', user.cookie).buffer(true).parse(binaryParser)
}

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-exports-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  film = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 30 } } })
}, 60_000)
afterAll(async () => {
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})
beforeEach(async () => {
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  const patientId = await insertTestPatient(db, users.fellow.id, {
    familyName: IDENTITY.familyName,
    givenName: IDENTITY.givenName,
    recordNumber: IDENTITY.recordNumber,
    birthDate: IDENTITY.birthDate,
    studyCode: 'EP-EXP001',
  })
  const visit = (visitDate: string, kind: 'pre-op' | 'post-op') =>
    insertVisit(db, {
      patientId,
      visitDate,
      kind,
      monthsSinceSurgery: null,
      indication: `Indication of ${IDENTITY.familyName}`,
      createdBy: users.fellow.id,
    })
  const preOp = await visit(VISIT_DATES[0]!, 'pre-op')
  const postOp = await visit(VISIT_DATES[1]!, 'post-op')
  studyId = await insertStudyWith(db, users.researcher.id, [patientId])
  const preOpFilm = await uploadPhantomFilm(app, users.fellow.cookie, preOp, film)
  const postOpFilm = await uploadPhantomFilm(app, users.fellow.cookie, postOp, film)
  slipReadingId = (
    await readPhantomAt(app, users.fellow.cookie, film, preOpFilm, 'slip-grade', {
      segment: 'L5-S1',
    })
  ).id
  await readPhantomAt(app, users.fellow.cookie, film, postOpFilm, 'lumbar-alignment', {})
  // A reading of a re-reading round: blinded, never in a clinical export.
  const slipRow = await db(TABLES.readings).where({ id: slipReadingId }).first()
  const { id: _id, ...copy } = slipRow
  await db(TABLES.readings).insert({ ...copy, blinded: true })

  // A patient outside the researcher's studies, whose study code would run as a formula.
  const outsider = await insertTestPatient(db, users.fellow.id, {
    familyName: IDENTITY.outsiderName,
    recordNumber: IDENTITY.outsiderRecord,
    studyCode: '=EP-EVIL1',
  })
  const outsiderVisit = await insertVisit(db, {
    patientId: outsider,
    visitDate: '2026-05-05',
    kind: 'pre-op',
    monthsSinceSurgery: null,
    indication: null,
    createdBy: users.fellow.id,
  })
  const outsiderFilm = await uploadPhantomFilm(app, users.fellow.cookie, outsiderVisit, film)
  await readPhantomAt(app, users.fellow.cookie, film, outsiderFilm, 'slip-grade', {
    segment: 'L5-S1',
  })
}, 60_000)

describe('GET /api/exports/measurements.csv', () => {
  it('has one row per reading and segment, every measure with its unit in the header', async () => {
    const res = await download(users.surgeon, '/api/exports/measurements.csv')
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8')
    expect(res.headers['content-disposition']).toBe(
      'attachment; filename="endplate-measurements-all.csv"',
    )
    const { headers, rows } = parseCsv(res.body.toString('utf8'))
    expect(headers).toEqual(MEASUREMENT_COLUMNS.map((column) => column.header))
    for (const header of [
      'slip (%)',
      'slip (mm)',
      'segmental_lordosis (deg)',
      'disc_height_mean (mm)',
      'age_at_visit (years)',
      'days_since_surgery (days)',
      'pelvic_incidence (deg)',
      'calibration_source',
      'rater',
      'engine_version',
      'status',
      'study_code',
    ]) {
      expect(headers).toContain(header)
    }
    // Slip grade at L5-S1 (1 row) and lumbar alignment L1–S1 (5 rows) for the study patient,
    // one slip grade for the outsider; the blinded copy is left out.
    expect(rows).toHaveLength(7)
    const reading = columnIndex(headers, 'reading_id')
    expect(rows.filter((row) => row[reading] === String(slipReadingId))).toHaveLength(1)
  })

  it('gives the engine values, the calibration source and days since surgery instead of dates', async () => {
    const res = await download(users.researcher, '/api/exports/measurements.csv')
    const { headers, rows } = parseCsv(res.body.toString('utf8'))
    const slipRow = rows.find(
      (row) => row[columnIndex(headers, 'reading_id')] === String(slipReadingId),
    )!
    const stored = await request(app)
      .get(`/api/readings/${slipReadingId}`)
      .set('Cookie', users.surgeon.cookie)
    const l5s1 = stored.body.results.measurements.segments['L5-S1']
    expect(Number(slipRow[columnIndex(headers, 'slip (%)')])).toBeCloseTo(l5s1.slipPercent, 9)
    // The phantom was made with a 30 % slip (its ground truth, placed exactly).
    expect(Number(slipRow[columnIndex(headers, 'slip (%)')])).toBeCloseTo(30, 0)
    expect(slipRow[columnIndex(headers, 'meyerding_grade')]).toBe('II')
    expect(slipRow[columnIndex(headers, 'calibration_source')]).toBe(stored.body.calibration.source)
    expect(slipRow[columnIndex(headers, 'rater')]).toBe(`R${users.fellow.id}`)
    // Pre-op on 2026-01-10, first post-op visit 2026-03-01: 50 days before surgery.
    expect(slipRow[columnIndex(headers, 'days_since_surgery (days)')]).toBe('-50')
    expect(slipRow[columnIndex(headers, 'age_at_visit (years)')]).toBe('64')
    expect(slipRow[columnIndex(headers, 'visit_kind')]).toBe('pre-op')
  })

  it('filters by study, visit kind, template and status', async () => {
    const count = async (query: string) =>
      parseCsv(
        (await download(users.surgeon, `/api/exports/measurements.csv?${query}`)).body.toString(
          'utf8',
        ),
      ).rows.length
    expect(await count(`studyId=${studyId}`)).toBe(6)
    expect(await count('visitKind=post-op')).toBe(5)
    expect(await count('visitKind=pre-op&template=slip-grade')).toBe(2)
    expect(await count('template=lumbar-alignment,slip-grade')).toBe(7)
    expect(await count('status=draft')).toBe(0)
    expect(await count('status=submitted')).toBe(7)
    const counted = await request(app)
      .get(`/api/exports/measurements/count?studyId=${studyId}`)
      .set('Cookie', users.surgeon.cookie)
    expect(counted.body).toEqual({ readings: 2, rows: 6 })
    const bad = await request(app)
      .get('/api/exports/measurements.csv?visitKind=someday')
      .set('Cookie', users.surgeon.cookie)
    expect(bad.status).toBe(400)
    expect(bad.body.error.message).toMatch(/visitKind must be one of pre-op, post-op, follow-up/)
  })

  it('escapes text that a spreadsheet would run as a formula, and keeps numbers numbers', async () => {
    const res = await download(users.surgeon, '/api/exports/measurements.csv?visitKind=pre-op')
    const { headers, rows } = parseCsv(res.body.toString('utf8'))
    const codes = rows.map((row) => row[columnIndex(headers, 'study_code')])
    expect(codes).toContain("'=EP-EVIL1")
    expect(codes).not.toContain('=EP-EVIL1')
    // A negative number is written bare, without the apostrophe.
    expect(rows.map((row) => row[columnIndex(headers, 'days_since_surgery (days)')])).toContain(
      '-50',
    )
  })

  it('audits each export with its filter and row count', async () => {
    await download(
      users.researcher,
      `/api/exports/measurements.csv?studyId=${studyId}&visitKind=pre-op`,
    )
    // The export is audited once the last row is written, just after the download ends.
    let [event] = await db(TABLES.auditEvents).where({ action: 'export' })
    for (let wait = 0; !event && wait < 40; wait++) {
      await new Promise((resolveWait) => setTimeout(resolveWait, 50))
      ;[event] = await db(TABLES.auditEvents).where({ action: 'export' })
    }
    // One event for the request: the export's own, no separate read event.
    expect(await db(TABLES.auditEvents).where({ user_id: users.researcher.id })).toHaveLength(1)
    expect(event).toMatchObject({
      user_id: users.researcher.id,
      entity: 'measurements',
      entity_id: String(studyId),
    })
    expect(event.summary).toBe(
      `Exported 1 measurement rows as CSV: study ${studyId}, visit kind pre-op, de-identified`,
    )
  })
})

describe("a researcher's exports hold nothing that identifies a patient", () => {
  const identifying = [
    IDENTITY.familyName,
    IDENTITY.givenName,
    IDENTITY.recordNumber,
    IDENTITY.birthDate,
    IDENTITY.outsiderName,
    IDENTITY.outsiderRecord,
    ...VISIT_DATES,
    'record_number',
    'family_name',
    'birth_date',
    'visit_date',
    'Test fellow',
  ]

  it('in CSV, searched byte by byte, and only for the studies they belong to', async () => {
    const res = await download(users.researcher, '/api/exports/measurements.csv')
    const text = res.body.toString('utf8')
    for (const value of identifying) expect(text).not.toContain(value)
    expect(text).not.toContain('EVIL1')
    expect(parseCsv(text).rows).toHaveLength(6)
  })

  it('in XLSX, every part of the workbook unpacked and searched', async () => {
    const res = await download(users.researcher, '/api/exports/measurements.xlsx')
    expect(res.status).toBe(200)
    const text = xlsxText(res.body)
    for (const value of identifying) expect(text).not.toContain(value)
    // It reads back: measurements and the data dictionary, numbers as numbers.
    const workbook = new ExcelJS.Workbook()
    await workbook.xlsx.load(res.body)
    const [measurements, dictionary] = workbook.worksheets
    expect(measurements!.name).toBe('Measurements')
    expect(measurements!.rowCount).toBe(1 + 6)
    expect(measurements!.getRow(1).values).toContain('slip (%)')
    const slipColumn = (measurements!.getRow(1).values as unknown[]).indexOf('slip (%)')
    expect(typeof measurements!.getRow(2).getCell(slipColumn).value).toBe('number')
    expect(dictionary!.name).toBe('Data dictionary')
    expect(dictionary!.rowCount).toBe(1 + MEASUREMENT_COLUMNS.length)
  })

  it('refuses identified columns to a researcher (403) and a study they are not in (404)', async () => {
    const identified = await request(app)
      .get('/api/exports/measurements.csv?identified=true')
      .set('Cookie', users.researcher.cookie)
    expect(identified.status).toBe(403)
    const otherStudy = await insertStudyWith(db, users.surgeon.id, [])
    await db(TABLES.studyMembers)
      .where({ study_id: otherStudy, user_id: users.surgeon.id })
      .delete()
    const notMine = await request(app)
      .get(`/api/exports/measurements.csv?studyId=${otherStudy}`)
      .set('Cookie', users.researcher.cookie)
    expect(notMine.status).toBe(404)
    expect(await db(TABLES.auditEvents).where({ action: 'export' })).toHaveLength(0)
  })
})

describe('identified exports and the data dictionary', () => {
  it('gives a surgeon who asks the identifying columns first', async () => {
    const res = await download(
      users.surgeon,
      `/api/exports/measurements.csv?identified=true&studyId=${studyId}`,
    )
    const { headers, rows } = parseCsv(res.body.toString('utf8'))
    expect(headers.slice(0, 6)).toEqual([
      'record_number',
      'family_name',
      'given_name',
      'birth_date',
      'visit_date',
      'rater_name',
    ])
    const slipRow = rows.find(
      (row) => row[columnIndex(headers, 'reading_id')] === String(slipReadingId),
    )!
    expect(slipRow.slice(0, 5)).toEqual([
      IDENTITY.recordNumber,
      IDENTITY.familyName,
      IDENTITY.givenName,
      IDENTITY.birthDate,
      VISIT_DATES[0],
    ])
  })

  it('names each column with its unit, type, definition and source in plain words', async () => {
    const res = await download(users.researcher, '/api/exports/data-dictionary.csv')
    expect(res.status).toBe(200)
    const { headers, rows } = parseCsv(res.body.toString('utf8'))
    expect(headers).toEqual(['column', 'unit', 'type', 'definition', 'source'])
    expect(rows.map((row) => row[0])).toEqual(MEASUREMENT_COLUMNS.map((column) => column.header))
    const slip = rows.find((row) => row[0] === 'slip (%)')!
    expect(slip[1]).toBe('%')
    expect(slip[4]).toMatch(/Taillard/)
    const text = res.body.toString('utf8')
    expect(text).not.toMatch(/\[(V|M|D|V-sec)\]/)
    for (const row of rows) expect(row[3]!.length).toBeGreaterThan(3)
  })

  it('is refused to fellows and administrators', async () => {
    for (const who of [users.fellow, users.admin]) {
      const res = await request(app).get('/api/exports/measurements.csv').set('Cookie', who.cookie)
      expect(res.status).toBe(403)
    }
  })
})

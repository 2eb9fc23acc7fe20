// Measurement export of 100 000 rows (20 000 lumbar-alignment readings × 5 segments) from the
// database as CSV and as XLSX, beside the same libraries (csv-stringify, exceljs's streaming
// writer) writing the same rows from memory with no database, in the same run, three times each
// in turn. Target: ratio of the median times ≤ 1.5. Memory is printed for 10 000 and 100 000 rows
// to show it stays flat as rows grow. The export reads and computes its rows on worker threads
// (server/exports/export-row-pool.ts); the workers are started first (as the size request before
// a download does), and that time is printed on its own.
// The rows live in a bench database of their own, seeded at the start of each run and emptied
// at its end (the exports write audit events, which are not kept).
// Prints figures only; no assertions.
import { Writable } from 'node:stream'
import { config } from '../config'
import { openMigratedDatabase, truncateAllTables } from '../cli/database-lifecycle'
import type { Db } from '../db/knex'
import { TABLES } from '../db/tables'
import { toResultsColumns } from '../db/reading-results-columns'
import { insertUser } from '../db/users'
import { phantomGroundTruth } from '../phantom/generate-phantom'
import { computeMeasurements, computeUncertainty } from '../../shared/measurement/index'
import type { ReadingResults } from '../../shared/types/readings'
import {
  prepareMeasurementExport,
  writeMeasurementExport,
  type ExportFormat,
} from '../services/exports'
import { writeCsv, writeXlsx, type TableSheet } from '../exports/write-table'
import { openMeasurementRowStream } from '../exports/export-rows'
import { closeExportPool, warmExportWorkers } from '../exports/export-row-pool'
import type { Cell } from '../exports/export-columns'
import type { Actor } from '../services/audit'

const READINGS = 20_000
const SMALL_STUDY_READINGS = 2_000
const PATIENTS = 2_000
const SEED_MARK = `export-bench-v1-${READINGS}`
/** Runs of each 100 000-row export: one run alone swings the ratio by ±0.15 on a 2-core machine. */
const RUNS = 3

/** A sink that drops every byte but, like a socket, asks the writer to wait now and then. */
function nullSink(): Writable & { bytes: number } {
  const sink = new Writable({
    highWaterMark: 64 * 1024,
    write(chunk: Buffer, _encoding, done) {
      sink.bytes += chunk.length
      setImmediate(done)
    },
  }) as Writable & { bytes: number }
  sink.bytes = 0
  return sink
}

interface Measured {
  ms: number
  /** This process's CPU time (user + system), which other load on the machine barely changes. */
  cpuMs: number
  peakRssMiB: number
  peakHeapMiB: number
  bytes: number
}

async function measure(
  work: (sink: Writable & { bytes: number }) => Promise<unknown>,
): Promise<Measured> {
  global.gc?.()
  const sink = nullSink()
  let peakRss = process.memoryUsage().rss
  let peakHeap = process.memoryUsage().heapUsed
  const sample = setInterval(() => {
    const usage = process.memoryUsage()
    peakRss = Math.max(peakRss, usage.rss)
    peakHeap = Math.max(peakHeap, usage.heapUsed)
  }, 5)
  const start = performance.now()
  const cpuStart = process.cpuUsage()
  await work(sink)
  const ms = performance.now() - start
  const cpu = process.cpuUsage(cpuStart)
  clearInterval(sample)
  return {
    ms,
    cpuMs: (cpu.user + cpu.system) / 1000,
    peakRssMiB: peakRss / 2 ** 20,
    peakHeapMiB: peakHeap / 2 ** 20,
    bytes: sink.bytes,
  }
}

/** The run with the median wall-clock time (RUNS is odd). */
function medianRun(runs: Measured[]): Measured {
  return [...runs].sort((a, b) => a.ms - b.ms)[Math.floor(runs.length / 2)] as Measured
}

/** The bench readings: one ground-truth lumbar alignment (with its uncertainty), many times. */
async function seed(db: Db): Promise<{ userId: number; smallStudyId: number }> {
  const marked = await db(TABLES.studies).where({ name: SEED_MARK }).first()
  if (marked) {
    const small = await db(TABLES.studies)
      .where({ name: `${SEED_MARK}-small` })
      .first()
    return { userId: marked.created_by, smallStudyId: small.id }
  }
  console.log(`  seeding ${READINGS} readings on ${PATIENTS} patients ...`)
  await truncateAllTables(db)
  const userId = await insertUser(db, {
    email: 'export-bench@bench.invalid',
    displayName: 'Export bench',
    role: 'surgeon',
    passwordHash: 'x',
  })
  const truth = phantomGroundTruth({})
  const document = truth.landmarks as Parameters<typeof computeMeasurements>[0]
  const results: ReadingResults = {
    measurements: computeMeasurements(document),
    uncertainty: computeUncertainty(document),
    motion: null,
    subsidence: null,
    subsidenceBaselineReadingId: null,
  }
  const resultsColumns = toResultsColumns(results)
  const landmarksJson = JSON.stringify(truth.landmarks)
  const patientIds: number[] = []
  for (let start = 0; start < PATIENTS; start += 500) {
    const rows = Array.from({ length: Math.min(500, PATIENTS - start) }, (_, i) => ({
      record_number: `BENCH-${start + i}`,
      family_name: 'Bench',
      given_name: 'Patient',
      birth_date: '1960-06-15',
      sex: 'female',
      study_code: `EP-B${String(start + i).padStart(5, '0')}`,
      created_by: userId,
    }))
    await db(TABLES.patients).insert(rows)
  }
  for (const row of await db(TABLES.patients).select('id').orderBy('id')) patientIds.push(row.id)
  await db(TABLES.visits).insert(
    patientIds.map((patientId) => ({
      patient_id: patientId,
      visit_date: '2026-03-02',
      kind: 'pre-op',
      created_by: userId,
    })),
  )
  const visits = await db(TABLES.visits).select('id', 'patient_id').orderBy('id')
  await db(TABLES.images).insert(
    visits.map((visit) => ({
      visit_id: visit.id,
      view: 'lateral-neutral',
      file_kind: 'dicom',
      content_hash: String(visit.id).padStart(64, '0'),
      original_path: `bench/${visit.id}/original.dcm`,
      display_path: `bench/${visit.id}/display.webp`,
      preview_path: `bench/${visit.id}/preview.webp`,
      thumbnail_path: `bench/${visit.id}/thumbnail.webp`,
      full_depth_path: `bench/${visit.id}/full.png`,
      original_name: 'bench.dcm',
      size_bytes: 1,
      width: 3000,
      height: 2500,
      bits_stored: 16,
      spacing_source: 'dicom-pixel-spacing',
      uploaded_by: userId,
    })),
  )
  const images = (await db(TABLES.images).select('id').orderBy('id')).map((row) => row.id as number)
  const perImage = READINGS / images.length
  for (let start = 0; start < READINGS; start += 500) {
    const rows = Array.from({ length: Math.min(500, READINGS - start) }, (_, i) => ({
      image_id: images[Math.floor((start + i) / perImage)],
      rater_id: userId,
      template: 'lumbar-alignment',
      template_options: '{}',
      landmarks: landmarksJson,
      calibration: JSON.stringify({ mmPerPixel: [0.139, 0.139], source: 'dicom-pixel-spacing' }),
      ...resultsColumns,
      engine_version: 'bench',
      status: 'submitted',
    }))
    await db(TABLES.readings).insert(rows)
  }
  const [studyId] = await db(TABLES.studies).insert({ name: SEED_MARK, created_by: userId })
  const [smallStudyId] = await db(TABLES.studies).insert({
    name: `${SEED_MARK}-small`,
    created_by: userId,
  })
  await db(TABLES.studyPatients).insert(
    patientIds.map((id) => ({ study_id: studyId, patient_id: id })),
  )
  // The readings of the first patients, in image order: 10 % of them for the 10 000-row export.
  const smallPatients = patientIds.slice(
    0,
    Math.round(PATIENTS * (SMALL_STUDY_READINGS / READINGS)),
  )
  await db(TABLES.studyPatients).insert(
    smallPatients.map((id) => ({ study_id: smallStudyId, patient_id: id })),
  )
  return { userId, smallStudyId: smallStudyId as number }
}

export async function run(): Promise<void> {
  const db = await openMigratedDatabase(config, `${config.DB_NAME}_bench_export`)
  try {
    const { userId, smallStudyId } = await seed(db)
    const actor: Actor = {
      user: {
        id: userId,
        email: 'export-bench@bench.invalid',
        displayName: 'Export bench',
        role: 'surgeon',
      },
      ip: null,
    }
    const all = await prepareMeasurementExport(db, actor, {})
    const small = await prepareMeasurementExport(db, actor, { studyId: smallStudyId })
    // The rows the database path produces, held in memory once for the library-only runs.
    const sample: Cell[][] = []
    const smallRows = await openMeasurementRowStream(db, small.filter, small.columns)
    for await (const row of smallRows) {
      sample.push(row as Cell[])
      if (sample.length === 5) break
    }
    const headers = all.columns.map((column) => column.header)
    function* sameRows(count: number): Generator<Cell[]> {
      for (let i = 0; i < count; i += 1) yield sample[i % sample.length] as Cell[]
    }
    const libraryOnly = (format: ExportFormat, count: number) => (sink: Writable) => {
      const sheet: TableSheet = { name: 'Measurements', headers, rows: sameRows(count) }
      return format === 'csv' ? writeCsv(sheet, sink) : writeXlsx([sheet], sink)
    }
    const fromDatabase = (format: ExportFormat, prepared: typeof all) => (sink: Writable) =>
      writeMeasurementExport(db, actor, prepared, format, sink)

    console.log(
      `export.bench: ${READINGS * 5} rows × ${headers.length} columns, ${RUNS} runs of each 100 000-row export, alternating`,
    )
    const warmStart = performance.now()
    await warmExportWorkers()
    console.log(`  export workers started in ${(performance.now() - warmStart).toFixed(0)} ms`)
    for (const format of ['csv', 'xlsx'] as const) {
      await measure(libraryOnly(format, 1000))
      // The small export first, so its RSS is not the high-water mark left by the large ones.
      const smallDatabase = await measure(fromDatabase(format, small))
      // Library and database runs alternate, so a passing load on the machine touches both.
      const library: Measured[] = []
      const database: Measured[] = []
      for (let run = 0; run < RUNS; run += 1) {
        library.push(await measure(libraryOnly(format, READINGS * 5)))
        database.push(await measure(fromDatabase(format, all)))
      }
      const line = (label: string, figures: Measured) =>
        console.log(
          `  ${label.padEnd(44)} ${figures.ms.toFixed(0).padStart(6)} ms (CPU ${figures.cpuMs.toFixed(0).padStart(5)} ms)  peak RSS ${figures.peakRssMiB.toFixed(0)} MiB, heap ${figures.peakHeapMiB.toFixed(0)} MiB, ${(figures.bytes / 1e6).toFixed(1)} MB`,
        )
      const runsOf = (figures: Measured[]) => figures.map((f) => f.ms.toFixed(0)).join(', ')
      const libraryMedian = medianRun(library)
      const databaseMedian = medianRun(database)
      console.log(`  ${format.toUpperCase()}`)
      line(`library alone, ${READINGS * 5} rows from memory (median)`, libraryMedian)
      line(`export from the database, ${READINGS * 5} rows (median)`, databaseMedian)
      line(`export from the database, ${SMALL_STUDY_READINGS * 5} rows`, smallDatabase)
      console.log(`    runs: library ${runsOf(library)} ms; database ${runsOf(database)} ms`)
      const ratio = databaseMedian.ms / libraryMedian.ms
      const ratios = database.map((run, i) => run.ms / (library[i] as Measured).ms)
      // The CPU ratio counts this process only (MariaDB works in its own), but holds steady
      // when other programs load the machine; the wall-clock ratio of the medians is the target.
      console.log(
        `    ratio of medians ${ratio.toFixed(2)} (target ≤ 1.5) ${ratio <= 1.5 ? 'MET' : 'MISSED'}; run by run ${Math.min(...ratios).toFixed(2)}–${Math.max(...ratios).toFixed(2)}; on this process's CPU time ${(databaseMedian.cpuMs / libraryMedian.cpuMs).toFixed(2)}`,
      )
      console.log(
        `    memory 10 k → 100 k rows: heap ${smallDatabase.peakHeapMiB.toFixed(0)} → ${databaseMedian.peakHeapMiB.toFixed(0)} MiB, RSS ${smallDatabase.peakRssMiB.toFixed(0)} → ${Math.max(...database.map((run) => run.peakRssMiB)).toFixed(0)} MiB (highest run)`,
      )
    }
    // The bench audits its exports like any other; the trail of a scratch database is not kept.
    await truncateAllTables(db)
  } finally {
    await closeExportPool()
    await db.destroy()
  }
}

// Visit report with two full-size films (3000 × 2500 phantoms, each with a Lumbar alignment
// reading) and the changes against a previous visit: the time from the request's data to the
// finished PDF (database reads, engine, two films cropped and composited by sharp, pdfkit), on a
// bench database of its own. Target: under 1.5 s. Also the peak memory while reports are made.
// Prints figures only; no assertions.
import { createHash } from 'node:crypto'
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { config } from '../config'
import { openMigratedDatabase, truncateAllTables } from '../cli/database-lifecycle'
import type { Db } from '../db/knex'
import { TABLES } from '../db/tables'
import { insertUser } from '../db/users'
import { insertPatient } from '../db/patients'
import { insertVisit } from '../db/visits'
import { uploadImages } from '../services/images'
import { createReading, submitReading } from '../services/readings'
import { readingReportPdf, visitReportPdf } from '../services/reports'
import type { Actor } from '../services/audit'
import { createLocalFileStore } from '../storage/local-file-store'
import type { FileStore } from '../storage/file-store'
import { generatePhantom, phantomDicom } from '../phantom/generate-phantom'
import type { PhantomParamsInput } from '../phantom/phantom-params'
import { templateLandmarks } from '../../shared/readings/templates'
import type { ImageView } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'

const RUNS = 7

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  const middle = sorted.length >> 1
  return sorted.length % 2
    ? (sorted[middle] as number)
    : ((sorted[middle - 1] as number) + (sorted[middle] as number)) / 2
}

/** Files a full-size phantom on a visit and reads it at its exact landmarks, submitted. */
async function filmWithReading(
  db: Db,
  store: FileStore,
  root: string,
  actor: Actor,
  visitId: number,
  view: ImageView,
  params: PhantomParamsInput,
): Promise<void> {
  const film = await generatePhantom({ widthPx: 3000, heightPx: 2500, ...params })
  const dicom = phantomDicom(film)
  const path = join(root, `upload-${visitId}-${view}.dcm`)
  writeFileSync(path, dicom)
  const [image] = await uploadImages(db, store, actor, visitId, {
    files: [
      {
        path,
        size: dicom.length,
        sha256: createHash('sha256').update(dicom).digest('hex'),
        originalName: `${view}.dcm`,
      },
    ],
    views: [view],
    confirmPatientMismatch: true,
    workDir: join(root, 'tmp'),
  })
  const truth = film.landmarks.points
  const points: Record<string, PixelPoint> = {}
  for (const spec of templateLandmarks('lumbar-alignment')) {
    const point = truth[spec.name]
    if (point) points[spec.name] = point
  }
  const reading = await createReading(db, actor, image!.id, {
    template: 'lumbar-alignment',
    points,
  })
  await submitReading(db, actor, reading.id, reading.version)
}

export async function run(): Promise<void> {
  const db = await openMigratedDatabase(config, `${config.DB_NAME}_bench`)
  const root = mkdtempSync(join(tmpdir(), 'endplate-bench-reports-'))
  const store = createLocalFileStore(join(root, 'store'))
  mkdirSync(join(root, 'tmp'))
  try {
    await truncateAllTables(db)
    const userId = await insertUser(db, {
      email: 'bench.surgeon@bench.invalid',
      displayName: 'Bench surgeon',
      role: 'surgeon',
      passwordHash: 'x',
    })
    const actor: Actor = {
      user: {
        id: userId,
        email: 'bench.surgeon@bench.invalid',
        displayName: 'Bench surgeon',
        role: 'surgeon',
      },
      ip: null,
    }
    const patientId = await insertPatient(db, {
      recordNumber: 'BENCH-REPORT-1',
      familyName: 'Benchmark',
      givenName: 'Phantom',
      birthDate: '1966-04-12',
      sex: 'female',
      osteoporosis: false,
      notes: null,
      studyCode: 'EP-BENCH2',
      createdBy: userId,
    })
    const visit = (visitDate: string, kind: 'pre-op' | 'post-op') =>
      insertVisit(db, {
        patientId,
        visitDate,
        kind,
        monthsSinceSurgery: null,
        indication: null,
        createdBy: userId,
      })
    const preOp = await visit('2026-01-12', 'pre-op')
    const postOp = await visit('2026-03-02', 'post-op')
    const before = { segments: { 'L4-L5': { segmentalAngleDeg: 19, slipPercent: 12 } } }
    const after = { segments: { 'L4-L5': { segmentalAngleDeg: 27, slipPercent: 3 } } }
    await filmWithReading(db, store, root, actor, preOp, 'lateral-neutral', before)
    await filmWithReading(db, store, root, actor, postOp, 'lateral-neutral', after)
    await filmWithReading(db, store, root, actor, postOp, 'lateral-standing-long', {
      ...after,
      seed: 2,
    })

    let peakRss = process.memoryUsage().rss
    const startRss = peakRss
    const sample = setInterval(() => {
      peakRss = Math.max(peakRss, process.memoryUsage().rss)
    }, 5)
    let bytes = 0
    // One run first: it reads the font files and warms sharp's and pdfkit's code paths.
    bytes = (await visitReportPdf(db, store, actor, postOp)).length
    const times: number[] = []
    for (let i = 0; i < RUNS; i++) {
      const start = performance.now()
      await visitReportPdf(db, store, actor, postOp)
      times.push(performance.now() - start)
    }
    const readingTimes: number[] = []
    const readingId = (await db(TABLES.readings).max({ id: 'id' }).first())?.id as number
    for (let i = 0; i < RUNS; i++) {
      const start = performance.now()
      await readingReportPdf(db, store, actor, readingId)
      readingTimes.push(performance.now() - start)
    }
    clearInterval(sample)
    peakRss = Math.max(peakRss, process.memoryUsage().rss)
    console.log(
      `reports.bench: visit report, two 3000 × 2500 films with Lumbar alignment readings and the changes against the previous visit; ${RUNS} runs`,
    )
    console.log(
      `  visit report PDF: median ${median(times).toFixed(0)} ms, slowest ${Math.max(...times).toFixed(0)} ms (target < 1500 ms); ${(bytes / 1024).toFixed(0)} KiB`,
    )
    console.log(`  reading report PDF (one film): median ${median(readingTimes).toFixed(0)} ms`)
    console.log(
      `  peak RSS while making reports ${(peakRss / 2 ** 20).toFixed(0)} MiB (${((peakRss - startRss) / 2 ** 20).toFixed(0)} MiB above the start)`,
    )
  } finally {
    await db.destroy()
    rmSync(root, { recursive: true, force: true })
  }
}

// Run directly with `npx tsx server/bench/reports.bench.ts`; the bench runner imports run().
if (import.meta.url === `file://${process.argv[1]}`) await run()

// Ingest of a 3000 × 2500 16-bit DICOM phantom (parse, decode, renditions, thumbnail) beside
// sharp's own decode and resize of the same pixels, in the same run. Target: ratio ≤ 1.5.
// Then the whole upload service: the same plus the files written and the database row.
// Prints figures only; no assertions.
import { createHash } from 'node:crypto'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import sharp from 'sharp'
import { config } from '../config'
import { openMigratedDatabase, truncateAllTables } from '../cli/database-lifecycle'
import { insertUser } from '../db/users'
import { insertPatient } from '../db/patients'
import { insertVisit } from '../db/visits'
import { uploadImages } from '../services/images'
import { createLocalFileStore } from '../storage/local-file-store'
import { decodeFilm } from '../images/decode-film'
import { makeFilmRenditions } from '../images/renditions'
import { generatePhantom, phantomDicom } from '../phantom/generate-phantom'

const RUNS = 7

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  const middle = sorted.length >> 1
  return sorted.length % 2
    ? (sorted[middle] as number)
    : ((sorted[middle - 1] as number) + (sorted[middle] as number)) / 2
}

async function timed(work: () => Promise<unknown>): Promise<number> {
  const start = performance.now()
  await work()
  return performance.now() - start
}

export async function run(): Promise<void> {
  const film = await generatePhantom({ widthPx: 3000, heightPx: 2500 })
  const dicom = phantomDicom(film)
  // The same pixels as a 16-bit grey PNG: what sharp decodes natively.
  const png = await sharp(film.pixels, {
    raw: { width: film.width, height: film.height, channels: 1 },
  })
    .toColourspace('grey16')
    .png()
    .toBuffer()

  let peakRss = process.memoryUsage().rss
  const sample = setInterval(() => {
    peakRss = Math.max(peakRss, process.memoryUsage().rss)
  }, 5)

  const ingest = async () => {
    const decoded = await decodeFilm(dicom)
    await makeFilmRenditions(decoded)
  }
  // Sharp alone: decode the PNG and resize it to the preview and thumbnail, same encoder settings.
  const sharpOnly = () =>
    Promise.all(
      [2048, 256].map((size) =>
        sharp(png)
          .resize(size, size, { fit: 'inside' })
          .toColourspace('b-w')
          .webp({ quality: 90, effort: 0 })
          .toBuffer(),
      ),
    )

  await ingest()
  await sharpOnly()
  const ingestTimes: number[] = []
  const sharpTimes: number[] = []
  // Alternate so both see the same machine state (cache, other load, heap growth).
  for (let i = 0; i < RUNS; i++) {
    ingestTimes.push(await timed(ingest))
    sharpTimes.push(await timed(sharpOnly))
  }
  clearInterval(sample)
  peakRss = Math.max(peakRss, process.memoryUsage().rss)

  const ingestMedian = median(ingestTimes)
  const sharpMedian = median(sharpTimes)
  console.log(
    `ingest.bench: ${film.width} × ${film.height} 16-bit DICOM (${(dicom.length / 1e6).toFixed(1)} MB), ${RUNS} runs each`,
  )
  console.log(
    `  ingest (parse, decode, display + preview + thumbnail + 16-bit PNG): median ${ingestMedian.toFixed(0)} ms`,
  )
  console.log(
    `  sharp alone (decode 16-bit PNG, resize to 2048 and 256):          median ${sharpMedian.toFixed(0)} ms`,
  )
  console.log(`  ratio ${(ingestMedian / sharpMedian).toFixed(2)} (target ≤ 1.5)`)
  console.log(`  peak RSS ${(peakRss / 2 ** 20).toFixed(0)} MiB`)
  await benchUploadService(dicom)
}

/** The upload service end to end on a bench database: decode, renditions, files, row, audit. */
async function benchUploadService(dicom: Buffer): Promise<void> {
  const db = await openMigratedDatabase(config, `${config.DB_NAME}_bench`)
  try {
    await truncateAllTables(db)
    const userId = await insertUser(db, {
      email: 'bench@bench.invalid',
      displayName: 'Bench',
      role: 'fellow',
      passwordHash: 'x',
    })
    const actor = {
      user: {
        id: userId,
        email: 'bench@bench.invalid',
        displayName: 'Bench',
        role: 'fellow' as const,
      },
      ip: null,
    }
    const patientId = await insertPatient(db, {
      recordNumber: 'BENCH-1',
      familyName: 'PHANTOM',
      givenName: 'LUMBAR',
      birthDate: '1970-01-01',
      sex: 'other',
      osteoporosis: false,
      notes: null,
      studyCode: 'EP-BENCH1',
      createdBy: userId,
    })
    const sha256 = createHash('sha256').update(dicom).digest('hex')
    const times: number[] = []
    for (let i = 0; i < RUNS; i++) {
      // A fresh visit and a fresh store each time, so every run writes its files and its row.
      const visitId = await insertVisit(db, {
        patientId,
        visitDate: '2026-01-01',
        kind: 'pre-op',
        monthsSinceSurgery: null,
        indication: null,
        createdBy: userId,
      })
      const root = mkdtempSync(join(tmpdir(), 'endplate-bench-store-'))
      const path = join(root, 'upload.dcm')
      writeFileSync(path, dicom)
      times.push(
        await timed(() =>
          uploadImages(db, createLocalFileStore(root), actor, visitId, {
            files: [{ path, size: dicom.length, sha256, originalName: 'bench.dcm' }],
            views: ['lateral-neutral'],
            confirmPatientMismatch: true,
            workDir: join(root, 'tmp'),
          }),
        ),
      )
      rmSync(root, { recursive: true, force: true })
    }
    console.log(
      `  upload service (the above + files written + database row + audit): median ${median(times).toFixed(0)} ms`,
    )
  } finally {
    await db.destroy()
  }
}

// Run directly with `npx tsx server/bench/ingest.bench.ts`; the bench runner imports run().
if (import.meta.url === `file://${process.argv[1]}`) await run()

// Peak memory of 4 concurrent uploads of a 3000 × 2500 16-bit DICOM film through the upload
// service (worker-thread decoding and renditions, files, rows). Measured in a child process of
// its own, so the other benchmarks' heaps do not count, as the kernel's peak resident set
// (process.resourceUsage().maxRSS, which includes the worker threads). Target: under 1 GiB.
// Prints figures only; no assertions.
import { spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'

const CONCURRENT = 4
const TARGET_MIB = 1024

async function measureInThisProcess(): Promise<void> {
  const { config } = await import('../config')
  const { openMigratedDatabase, truncateAllTables } = await import('../cli/database-lifecycle')
  const { insertUser } = await import('../db/users')
  const { insertPatient } = await import('../db/patients')
  const { insertVisit } = await import('../db/visits')
  const { uploadImages } = await import('../services/images')
  const { createLocalFileStore } = await import('../storage/local-file-store')
  const { closeIngestPool } = await import('../images/ingest/ingest-pool')
  const { generatePhantom, phantomDicom } = await import('../phantom/generate-phantom')

  const dicom = phantomDicom(await generatePhantom({ widthPx: 3000, heightPx: 2500 }))
  const db = await openMigratedDatabase(config, `${config.DB_NAME}_bench`)
  const root = mkdtempSync(join(tmpdir(), 'endplate-bench-uploads-'))
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
    const visitId = await insertVisit(db, {
      patientId,
      visitDate: '2026-01-01',
      kind: 'pre-op',
      monthsSinceSurgery: null,
      indication: null,
      createdBy: userId,
    })
    const tmp = join(root, 'tmp')
    mkdirSync(tmp, { recursive: true })
    const store = createLocalFileStore(root)
    // Four different films (the last pixel differs), so none is deduplicated away.
    const files = Array.from({ length: CONCURRENT }, (_, i) => {
      const bytes = Buffer.from(dicom)
      bytes[bytes.length - 1] = i
      const path = join(tmp, `bench-${i}.upload`)
      writeFileSync(path, bytes)
      return { path, size: bytes.length, sha256: createHash('sha256').update(bytes).digest('hex') }
    })
    const before = process.memoryUsage().rss
    const start = performance.now()
    await Promise.all(
      files.map((file, i) =>
        uploadImages(db, store, actor, visitId, {
          files: [{ ...file, originalName: `bench-${i}.dcm` }],
          views: ['lateral-neutral'],
          confirmPatientMismatch: true,
          workDir: tmp,
        }),
      ),
    )
    const elapsed = performance.now() - start
    const peakMib = (process.resourceUsage().maxRSS * 1024) / 2 ** 20
    console.log(
      JSON.stringify({
        films: CONCURRENT,
        fileMb: dicom.length / 1e6,
        elapsedMs: elapsed,
        startRssMib: before / 2 ** 20,
        peakRssMib: peakMib,
      }),
    )
  } finally {
    await closeIngestPool()
    await db.destroy()
    rmSync(root, { recursive: true, force: true })
  }
}

export async function run(): Promise<void> {
  const self = fileURLToPath(import.meta.url)
  const child = spawnSync(process.execPath, ['--import', 'tsx', self, '--measure'], {
    encoding: 'utf8',
    env: process.env,
  })
  const line = child.stdout.trim().split('\n').pop() ?? ''
  if (child.status !== 0 || !line.startsWith('{')) {
    console.log(`upload-memory.bench: the measuring process failed\n${child.stdout}${child.stderr}`)
    process.exitCode = 1
    return
  }
  const figures = JSON.parse(line) as {
    films: number
    fileMb: number
    elapsedMs: number
    startRssMib: number
    peakRssMib: number
  }
  console.log(
    `upload-memory.bench: ${figures.films} concurrent uploads of a 3000 × 2500 16-bit DICOM (${figures.fileMb.toFixed(1)} MB each) through the upload service`,
  )
  console.log(`  all filed in ${figures.elapsedMs.toFixed(0)} ms`)
  console.log(
    `  peak RSS ${figures.peakRssMib.toFixed(0)} MiB (target < ${TARGET_MIB} MiB; ${figures.startRssMib.toFixed(0)} MiB before the uploads)`,
  )
}

if (process.argv.includes('--measure')) await measureInThisProcess()
else if (import.meta.url === `file://${process.argv[1]}`) await run()

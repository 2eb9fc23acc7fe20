// The load bench's data: 10 000 patients, one visit and one film each, and 100 000 slip-grade
// readings (ten per film), in a bench database of its own. Seeded once with multi-row inserts and
// INSERT … SELECT, and kept: a later run finds the mark and reuses the rows.
import { mkdir, writeFile } from 'node:fs/promises'
import { dirname, join } from 'node:path'
import sharp from 'sharp'
import type { Db } from '../../db/knex'
import { TABLES } from '../../db/tables'
import { insertUser } from '../../db/users'
import { truncateAllTables } from '../../cli/database-lifecycle'
import { createReading } from '../../services/readings'
import type { Role } from '../../../shared/types/domain'

export const LOAD_PATIENTS = 10_000
export const LOAD_READINGS = 100_000
const READINGS_PER_FILM = LOAD_READINGS / LOAD_PATIENTS
const SEED_MARK = `load-bench-v1-${LOAD_PATIENTS}-${LOAD_READINGS}`
const BATCH = 2_000
/** Every bench film shares one display rendition: the fetch measures serving, not the disk cache. */
export const LOAD_DISPLAY_KEY = 'films/be/bench-load/display.png'
const FAMILY_NAMES = ['Arden', 'Brook', 'Calder', 'Dale', 'Ellery', 'Fenn', 'Garrow', 'Hale']

/** A complete L5-S1 slip-grade set on a 3000 × 2500 px film. */
export const LOAD_POINTS: Record<string, [number, number]> = {
  'L5.as': [1700, 1000],
  'L5.ps': [1300, 1000],
  'L5.pi': [1300, 1300],
  'L5.ai': [1700, 1300],
  'S1.as': [1700, 1400],
  'S1.ps': [1300, 1400],
  'S1.pw': [1280, 1700],
}

export interface LoadSeed {
  fellowId: number
  /** Draft readings by the fellow, one per connection that saves. */
  draftReadingIds: number[]
  /** Each draft's version now (saves of earlier runs have counted them up). */
  draftVersions: Map<number, number>
  imageIds: number[]
}

async function inBatches<T>(rows: T[], insert: (batch: T[]) => Promise<unknown>): Promise<void> {
  for (let start = 0; start < rows.length; start += BATCH)
    await insert(rows.slice(start, start + BATCH))
}

/** A 3000 × 2500 8-bit PNG with some structure, about the size of a real display rendition. */
async function writeDisplayRendition(uploadDir: string): Promise<void> {
  const path = join(uploadDir, LOAD_DISPLAY_KEY)
  await mkdir(dirname(path), { recursive: true })
  const width = 3000
  const height = 2500
  const pixels = Buffer.alloc(width * height)
  for (let y = 0; y < height; y++)
    for (let x = 0; x < width; x++)
      pixels[y * width + x] = (Math.sin(x / 37) * 40 + Math.cos(y / 23) * 40 + ((x * y) % 17)) & 255
  await writeFile(
    path,
    await sharp(pixels, { raw: { width, height, channels: 1 } })
      .png()
      .toBuffer(),
  )
}

async function loadSeedOf(db: Db): Promise<LoadSeed> {
  const fellow = await db(TABLES.users).where({ email: 'load-fellow@bench.invalid' }).first()
  // One draft per film: saves of readings on the same film queue behind each other's lock on it.
  const drafts = (await db(TABLES.readings)
    .whereIn(
      'id',
      db(TABLES.readings)
        .where({ rater_id: fellow.id, status: 'draft' })
        .groupBy('image_id')
        .min('id'),
    )
    .orderBy('id')
    .limit(200)
    .select('id', 'version')) as { id: number; version: number }[]
  const images = await db(TABLES.images).orderBy('id').limit(200).pluck('id')
  return {
    fellowId: fellow.id as number,
    draftReadingIds: drafts.map((row) => row.id),
    draftVersions: new Map(drafts.map((row) => [row.id, row.version])),
    imageIds: images,
  }
}

export async function seedLoadBench(db: Db, uploadDir: string): Promise<LoadSeed> {
  await writeDisplayRendition(uploadDir)
  const marked = await db(TABLES.studies).where({ name: SEED_MARK }).first()
  if (marked) return loadSeedOf(db)
  console.log(
    `  seeding ${LOAD_PATIENTS} patients and ${LOAD_READINGS} readings (once; kept for later runs) ...`,
  )
  const started = performance.now()
  await truncateAllTables(db)
  const user = (role: Role, email: string) =>
    insertUser(db, { email, displayName: `Load ${role}`, role, passwordHash: 'x' })
  const surgeonId = await user('surgeon', 'load-surgeon@bench.invalid')
  const fellowId = await user('fellow', 'load-fellow@bench.invalid')

  await inBatches(
    Array.from({ length: LOAD_PATIENTS }, (_, i) => ({
      record_number: `LOAD-${String(i).padStart(6, '0')}`,
      family_name: `${FAMILY_NAMES[i % FAMILY_NAMES.length]}${i}`,
      given_name: 'Bench',
      birth_date: `19${40 + (i % 60)}-0${1 + (i % 9)}-1${i % 10}`,
      sex: i % 2 === 0 ? 'female' : 'male',
      study_code: `EP-L${String(i).padStart(6, '0')}`,
      created_by: surgeonId,
    })),
    (batch) => db(TABLES.patients).insert(batch),
  )
  await db.raw(
    `INSERT INTO ${TABLES.visits} (patient_id, visit_date, kind, created_by)
     SELECT id, '2026-03-02', 'pre-op', ? FROM ${TABLES.patients}`,
    [surgeonId],
  )
  await db.raw(
    `INSERT INTO ${TABLES.images} (visit_id, view, file_kind, content_hash, original_path,
       display_path, preview_path, thumbnail_path, full_depth_path, original_name, size_bytes,
       width, height, bits_stored, spacing_source, uploaded_by)
     SELECT id, 'lateral-neutral', 'png', LPAD(id, 64, '0'), CONCAT('bench/', id, '/original.png'),
       ?, ?, ?, ?, 'bench.png', 1, 3000, 2500, 8, 'none', ? FROM ${TABLES.visits}`,
    [LOAD_DISPLAY_KEY, LOAD_DISPLAY_KEY, LOAD_DISPLAY_KEY, LOAD_DISPLAY_KEY, surgeonId],
  )
  // One reading made by the service, so every stored column is as the app writes it; the rest
  // are copies of it on every film.
  const firstImage = (await db(TABLES.images).orderBy('id').first('id')) as { id: number }
  const template = await createReading(
    db,
    {
      user: {
        id: fellowId,
        email: 'load-fellow@bench.invalid',
        displayName: 'Load fellow',
        role: 'fellow',
      },
      ip: null,
    },
    firstImage.id,
    { template: 'slip-grade', options: { segment: 'L5-S1' }, points: LOAD_POINTS },
  )
  const columns = (
    (await db.raw(
      `SELECT COLUMN_NAME AS name FROM information_schema.COLUMNS
       WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? AND COLUMN_NAME NOT IN ('id', 'image_id')
       ORDER BY ORDINAL_POSITION`,
      [TABLES.readings],
    )) as [{ name: string }[]]
  )[0].map((row) => `\`${row.name}\``)
  const copies = Array.from({ length: READINGS_PER_FILM }, (_, i) => `SELECT ${i} AS n`).join(
    ' UNION ALL ',
  )
  await db.raw(
    `INSERT INTO ${TABLES.readings} (image_id, ${columns.join(', ')})
     SELECT i.id, ${columns.map((c) => `t.${c}`).join(', ')}
     FROM ${TABLES.images} i
     CROSS JOIN (${copies}) AS copies
     JOIN ${TABLES.readings} t ON t.id = ?
     WHERE NOT (i.id = ? AND copies.n = 0)`,
    [template.id, firstImage.id],
  )
  await db(TABLES.auditEvents).delete()
  await db(TABLES.studies).insert({ name: SEED_MARK, created_by: surgeonId })
  const [[count]] = (await db.raw(`SELECT COUNT(*) AS n FROM ${TABLES.readings}`)) as [
    { n: number }[],
  ]
  console.log(
    `  seeded ${count?.n} readings in ${((performance.now() - started) / 1000).toFixed(1)} s`,
  )
  return loadSeedOf(db)
}

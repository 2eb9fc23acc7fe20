import type { Db } from './knex'
import { TABLES } from './tables'

/**
 * Takes the row lock of each content hash inside the caller's transaction, creating the row
 * when it is new. Hashes are locked in sorted order, so two requests that share several films
 * cannot deadlock on each other.
 */
export async function lockFilmContents(trx: Db, hashes: string[]): Promise<void> {
  for (const hash of [...new Set(hashes)].sort()) {
    await trx.raw(
      'INSERT INTO ?? (content_hash) VALUES (?) ON DUPLICATE KEY UPDATE content_hash = content_hash',
      [TABLES.filmFiles, hash],
    )
    await trx(TABLES.filmFiles).where({ content_hash: hash }).forUpdate().select('content_hash')
  }
}

export async function deleteFilmContent(trx: Db, hash: string): Promise<void> {
  await trx(TABLES.filmFiles).where({ content_hash: hash }).delete()
}

/** Content hashes that have a row but no image using them (left by a crash or a failed upload). */
export async function listUnusedFilmContents(db: Db): Promise<string[]> {
  const rows = (await db(TABLES.filmFiles)
    .whereNotExists(
      db(TABLES.images)
        .select(db.raw('1'))
        .whereRaw('?? = ??', [`${TABLES.images}.content_hash`, `${TABLES.filmFiles}.content_hash`]),
    )
    .select('content_hash')) as Array<{ content_hash: string }>
  return rows.map((row) => row.content_hash)
}

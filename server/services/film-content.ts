import type { Db } from '../db/knex'
import { referencedKeysByHash } from '../db/images'
import { deleteFilmContent, lockFilmContents } from '../db/film-files'
import type { FileStore } from '../storage/file-store'

/** The store folder of one film content: every file of that hash lives under it. */
export function contentFolder(hash: string): string {
  return `films/${hash.slice(0, 2)}/${hash}/`
}

/**
 * Removes the files under a content hash's folder that no image row references, and the
 * content row itself once no image uses the hash. Runs under the content row's lock, which an
 * upload of the same film also takes before it moves files in: an upload either commits first
 * (and its files are referenced) or finds them gone and writes them again. Files modified at or
 * after `olderThan` are left alone (another process may be writing them). Answers the keys
 * removed.
 */
export async function removeUnreferencedFiles(
  db: Db,
  store: FileStore,
  hash: string,
  olderThan: Date = new Date(),
): Promise<string[]> {
  return db.transaction(
    async (trx) => {
      await lockFilmContents(trx, [hash])
      const referenced = (await referencedKeysByHash(trx, hash)).get(hash) ?? new Set<string>()
      const removed: string[] = []
      for await (const entry of store.list(contentFolder(hash))) {
        if (referenced.has(entry.key) || entry.modifiedAt >= olderThan) continue
        await store.remove(entry.key)
        removed.push(entry.key)
      }
      if (referenced.size === 0) await deleteFilmContent(trx, hash)
      return removed
    },
    { isolationLevel: 'read committed' },
  )
}

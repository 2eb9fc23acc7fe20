import type { Db } from '../db/knex'
import { countImagesWithHash } from '../db/images'
import { deleteFilmContent, lockFilmContents } from '../db/film-files'
import type { FileStore } from '../storage/file-store'

/** The store folder of one film content: every file of that hash lives under it. */
export function contentFolder(hash: string): string {
  return `films/${hash.slice(0, 2)}/${hash}/`
}

/**
 * Removes a film content's files and its row when no image uses the hash any more. Runs under
 * the content row's lock, which an upload of the same film also takes before it moves files in,
 * so an upload either commits first (and the files stay) or finds them gone and writes them
 * again. Files newer than `olderThan` are left alone (another process may be writing them).
 * Answers the keys removed.
 */
export async function removeUnusedContent(
  db: Db,
  store: FileStore,
  hash: string,
  olderThan: Date = new Date(),
): Promise<string[]> {
  return db.transaction(
    async (trx) => {
      await lockFilmContents(trx, [hash])
      if ((await countImagesWithHash(trx, hash)) > 0) return []
      const removed: string[] = []
      for await (const entry of store.list(contentFolder(hash))) {
        if (entry.modifiedAt >= olderThan) continue
        await store.remove(entry.key)
        removed.push(entry.key)
      }
      await deleteFilmContent(trx, hash)
      return removed
    },
    { isolationLevel: 'read committed' },
  )
}

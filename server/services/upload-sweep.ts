import { readdir, rm, stat } from 'node:fs/promises'
import { join } from 'node:path'
import type { Logger } from 'pino'
import type { Db } from '../db/knex'
import { referencedKeysByHash } from '../db/images'
import { listUnusedFilmContents } from '../db/film-files'
import type { FileStore } from '../storage/file-store'
import { removeUnreferencedFiles } from './film-content'

export interface SweepReport {
  temporaryFiles: string[]
  storedFiles: string[]
}

/** Temporary upload and rendition files last written before `olderThan`. */
async function sweepTemporaryFolder(tmpDir: string, olderThan: Date): Promise<string[]> {
  let names: string[]
  try {
    names = await readdir(tmpDir)
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return []
    throw error
  }
  const removed: string[] = []
  for (const name of names) {
    const path = join(tmpDir, name)
    const info = await stat(path).catch(() => null)
    if (!info?.isFile() || info.mtime >= olderThan) continue
    await rm(path, { force: true })
    removed.push(name)
  }
  return removed
}

/**
 * What a crash (SIGKILL, power loss) can leave behind, removed at start-up: half-written
 * temporary uploads and renditions, and stored originals or renditions that no image row
 * references (moved in by an upload whose transaction never committed, or a `.part` file of an
 * interrupted write). Only files older than `startedAt` are touched, and stored ones only under
 * their content row's lock (film-content.ts), so an upload running in another process at the
 * same time keeps its files. Logs what it removed.
 */
export async function sweepUploadLeftovers(options: {
  db: Db
  store: FileStore
  tmpDir: string
  logger: Logger
  startedAt?: Date
}): Promise<SweepReport> {
  const { db, store, logger } = options
  const startedAt = options.startedAt ?? new Date()
  const temporaryFiles = await sweepTemporaryFolder(options.tmpDir, startedAt)

  const referenced = await referencedKeysByHash(db)
  const suspects = new Set<string>(await listUnusedFilmContents(db))
  for await (const entry of store.list('films/')) {
    const hash = entry.key.split('/')[2]
    if (hash === undefined || entry.modifiedAt >= startedAt) continue
    if (!referenced.get(hash)?.has(entry.key)) suspects.add(hash)
  }
  const storedFiles: string[] = []
  for (const hash of suspects)
    storedFiles.push(...(await removeUnreferencedFiles(db, store, hash, startedAt)))

  if (temporaryFiles.length > 0 || storedFiles.length > 0) {
    logger.info(
      { temporaryFiles, storedFiles },
      `Start-up sweep removed ${temporaryFiles.length} temporary and ${storedFiles.length} unreferenced stored file(s)`,
    )
  }
  return { temporaryFiles, storedFiles }
}

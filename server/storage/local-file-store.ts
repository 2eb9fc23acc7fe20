import { createReadStream } from 'node:fs'
import { access, mkdir, readdir, readFile, rename, rm, stat, writeFile } from 'node:fs/promises'
import { dirname, join, relative, sep } from 'node:path'
import { randomUUID } from 'node:crypto'
import { assertSafeKey, type FileStore } from './file-store'

/** Files under one folder (UPLOAD_DIR). Writes go to a temporary name first, then rename. */
export function createLocalFileStore(root: string): FileStore {
  const pathOf = (key: string) => {
    assertSafeKey(key)
    return join(root, key)
  }
  return {
    async put(key, data) {
      const target = pathOf(key)
      await mkdir(dirname(target), { recursive: true })
      // A crash mid-write leaves a stray temporary file, never a truncated film under its real key.
      const temporary = `${target}.${randomUUID()}.part`
      await writeFile(temporary, data)
      await rename(temporary, target)
    },
    async putFile(key, localPath) {
      const target = pathOf(key)
      await mkdir(dirname(target), { recursive: true })
      // Same file system (temporary uploads live under the same root), so this is atomic.
      await rename(localPath, target)
    },
    read: (key) => readFile(pathOf(key)),
    open(key) {
      const stream = createReadStream(pathOf(key))
      // Resolve only once the file is open, so a missing file is known before any header is sent.
      return new Promise((resolveOpen, reject) => {
        stream.once('open', () => resolveOpen(stream))
        stream.once('error', (error: NodeJS.ErrnoException) => {
          if (error.code === 'ENOENT') resolveOpen(null)
          else reject(error)
        })
      })
    },
    async exists(key) {
      try {
        await access(pathOf(key))
        return true
      } catch {
        return false
      }
    },
    async remove(key) {
      await rm(pathOf(key), { force: true })
    },
    async *list(prefix) {
      const folder = pathOf(prefix.replace(/\/$/, ''))
      let entries
      try {
        entries = await readdir(folder, { withFileTypes: true, recursive: true })
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code === 'ENOENT') return
        throw error
      }
      for (const entry of entries) {
        if (!entry.isFile()) continue
        const path = join(entry.parentPath, entry.name)
        // A file removed since the listing (by another request) is simply skipped.
        const info = await stat(path).catch(() => null)
        if (info) yield { key: relative(root, path).split(sep).join('/'), modifiedAt: info.mtime }
      }
    },
  }
}

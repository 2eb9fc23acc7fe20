import type { Readable } from 'node:stream'

/**
 * Where films and renditions live. Keys are content-addressed paths such as
 * `films/ab/abcdef…/display.png`; nothing derived from a client's file name ever reaches a key.
 * The local folder is the first implementation; an S3-compatible store can take its place
 * behind the same interface when several servers share the files (SCALING.md).
 */
export interface FileStore {
  put(key: string, data: Buffer | Uint8Array): Promise<void>
  /** Moves a finished local file (an upload streamed to a temporary path) under the key. */
  putFile(key: string, localPath: string): Promise<void>
  read(key: string): Promise<Buffer>
  /** Opens a key for reading; resolves to null when it does not exist. */
  open(key: string): Promise<Readable | null>
  exists(key: string): Promise<boolean>
  remove(key: string): Promise<void>
  /** Every key under a folder prefix (ending in "/"), with its last modification time. */
  list(prefix: string): AsyncIterable<StoredEntry>
}

export interface StoredEntry {
  key: string
  modifiedAt: Date
}

/** Keys must be relative, slash-separated and free of `..`, whatever calls the store. */
export function assertSafeKey(key: string): void {
  if (
    !/^[a-z0-9][a-z0-9/_.-]*$/.test(key) ||
    key.split('/').some((part) => part === '..' || part === '.' || part === '')
  ) {
    throw new Error(`Unsafe storage key: ${key}`)
  }
}

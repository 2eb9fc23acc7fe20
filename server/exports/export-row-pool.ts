import { availableParallelism } from 'node:os'
import { PassThrough, Readable } from 'node:stream'
import { MessageChannel } from 'node:worker_threads'
import Tinypool from 'tinypool'
import type { Db } from '../db/knex'
import type { ExportFilter } from '../db/exports'
import type { ExportControlMessage, ExportRowMessage, ExportRowTask } from './export-row-task'

/** Heap ceiling of one export worker: a few batches of rows and one reading's results at a time. */
const WORKER_HEAP_MB = 256
/**
 * Room for short-lived objects (each reading's parsed results, each batch's rows): with V8's
 * default, most of them outlive a young collection and are copied to the old heap to die there.
 * Measured on the export bench: 100 000 rows in ~870 ms rather than ~960 ms.
 */
const YOUNG_GENERATION_MB = 64

let pool: Tinypool | null = null
/** Shares started and not yet settled (running or queued for a worker). */
let sharesRunning = 0

/** Workers one CSV export runs on: one per core. */
function shareCount(): number {
  return availableParallelism()
}

/** Workers the pool may run: two CSV exports at full width. */
function workerLimit(): number {
  return 2 * shareCount()
}

/**
 * Whether an export of this format would start at once rather than queue behind downloads in
 * progress (which hold their workers for as long as their readers take).
 */
export function exportWorkersFree(format: 'csv' | 'xlsx'): boolean {
  return sharesRunning + (format === 'csv' ? shareCount() : 1) <= workerLimit()
}

/**
 * Worker threads that read exports from MariaDB and compute their cells (export-row-task.ts),
 * so that none of that work runs on the API's event loop. A worker waits for its download's
 * reader, and a slow download holds it for minutes while using no CPU: the pool has room for
 * two exports at full width before further ones queue. Idle workers exit after a while and do
 * not keep the process alive.
 */
function exportPool(): Tinypool {
  pool ??= new Tinypool({
    filename: new URL('./export-row-worker.mjs', import.meta.url).href,
    name: 'exportRows',
    minThreads: 0,
    maxThreads: workerLimit(),
    idleTimeout: 30_000,
    resourceLimits: {
      maxOldGenerationSizeMb: WORKER_HEAP_MB,
      maxYoungGenerationSizeMb: YOUNG_GENERATION_MB,
    },
  })
  return pool
}

/**
 * The database and port a pool connects to, for a worker to open its own pool alike. The host
 * and the account are the configured ones (the application's), as for every API pool.
 */
function connectionOf(db: Db): { database: string; databasePort: number } {
  const connection = db.client.config.connection as { database: string; port: number }
  return { database: connection.database, databasePort: connection.port }
}

/**
 * One worker's share of an export as an object stream: cell arrays, or CSV text. The worker
 * sends batches and never runs more than a few ahead of this stream's reader, so memory stays
 * flat; destroying the stream (a download cut short) stops the worker's query. `onRows` hears
 * of the rows as they arrive.
 */
function openWorkerShare(
  db: Db,
  filter: ExportFilter,
  identified: boolean,
  format: ExportRowTask['format'],
  onRows: (count: number) => void,
): Readable {
  const { port1: channel, port2: workerChannel } = new MessageChannel()
  let owed = 0
  let ended = false
  const send = (message: ExportControlMessage) => channel.postMessage(message)
  const stream = new Readable({
    // One batch waits here at most; the worker holds the next few (BATCHES_AHEAD).
    objectMode: true,
    highWaterMark: 1,
    read() {
      // The reader wants more: pay back the batches held while it was busy.
      for (; owed > 0; owed -= 1) send('more')
    },
    destroy(error, done) {
      // The worker closes the channel (both ends) once it has stopped.
      if (!ended) send('stop')
      done(error)
    },
  })
  channel.on('message', (message: ExportRowMessage) => {
    if (message.type === 'end') {
      ended = true
      stream.push(null)
      return
    }
    // Rows that arrive after the download was cut short were never written: not counted.
    if (stream.destroyed) return
    let wantsMore = true
    if (message.type === 'csv') {
      onRows(message.rows)
      wantsMore = stream.push(message.text)
    } else {
      onRows(message.rows.length)
      for (const row of message.rows) wantsMore = stream.push(row)
    }
    if (wantsMore) send('more')
    else owed += 1
  })
  const task: ExportRowTask = {
    channel: workerChannel,
    ...connectionOf(db),
    filter,
    identified,
    format,
  }
  sharesRunning += 1
  exportPool()
    .run(task, { transferList: [workerChannel] })
    .catch((error: unknown) => {
      ended = true
      channel.close()
      stream.destroy(error instanceof Error ? error : new Error(String(error)))
    })
    .finally(() => {
      sharesRunning -= 1
    })
  return stream
}

/** An export's rows as cell arrays, read and computed in one worker thread. */
export function openRowStreamInWorker(
  db: Db,
  filter: ExportFilter,
  identified: boolean,
  onRows: (count: number) => void = () => {},
): Readable {
  return openWorkerShare(db, filter, identified, 'rows', onRows)
}

/**
 * An export's CSV records (no header), written by `count` workers (one per core unless told),
 * each taking a disjoint share of the films; a reading's rows stay together, shares interleave.
 */
export function openCsvRecordStreamInWorkers(
  db: Db,
  filter: ExportFilter,
  identified: boolean,
  onRows: (count: number) => void = () => {},
  count = shareCount(),
): Readable {
  const shares = Array.from({ length: count }, (_, index) =>
    openWorkerShare(db, { ...filter, share: { count, index } }, identified, 'csv', onRows),
  )
  const merged = new PassThrough({ objectMode: true, highWaterMark: 1 })
  let open = shares.length
  for (const share of shares) {
    share.pipe(merged, { end: false })
    share.on('end', () => {
      open -= 1
      if (open === 0) merged.end()
    })
    share.on('error', (error) => merged.destroy(error))
  }
  merged.on('close', () => {
    for (const share of shares) share.destroy()
  })
  return merged
}

/**
 * Starts the workers of one export ahead of it (the export panel asks a download's size as its
 * filters change), so the download does not wait for threads to load their code. Never fails:
 * an export whose workers cannot start reports that itself.
 */
export async function warmExportWorkers(): Promise<void> {
  const workers = exportPool()
  await Promise.all(
    Array.from({ length: shareCount() }, () => workers.run(null, { name: 'warm' }).catch(() => {})),
  )
}

/** Stops the workers (server shutdown); a later export starts a new pool. */
export async function closeExportPool(): Promise<void> {
  const closing = pool
  pool = null
  await closing?.destroy()
}

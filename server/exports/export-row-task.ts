import type { MessagePort } from 'node:worker_threads'
import { stringify } from 'csv-stringify/sync'
import { createDb, type Db } from '../db/knex'
import { openExportReadingStream, type ExportFilter } from '../db/exports'
import { exportColumns, type Cell, type ExportReading } from './export-columns'
import { readingRows } from './export-rows'
import { CSV_OPTIONS } from './write-table'

/** What the main thread asks of an export worker (export-row-pool.ts). */
export interface ExportRowTask {
  /** Where the rows go: batches out; credit and stop requests in. */
  channel: MessagePort
  /** The database the main thread's pool uses, and the port of its MariaDB. */
  database: string
  databasePort: number
  filter: ExportFilter
  identified: boolean
  /** Rows as cell arrays, or as CSV text (records only, each ending in a newline). */
  format: 'rows' | 'csv'
}

/** Messages from the worker to the main thread. */
export type ExportRowMessage =
  { type: 'rows'; rows: Cell[][] } | { type: 'csv'; text: string; rows: number } | { type: 'end' }

/** Messages from the main thread to the worker. */
export type ExportControlMessage = 'more' | 'stop'

/**
 * Rows per message, rounded up to whole readings: few enough messages that posting costs little,
 * small enough to stay young.
 */
const ROWS_PER_BATCH = 256
/** Batches the worker may send ahead of the main thread's writer before it waits. */
const BATCHES_AHEAD = 4

/**
 * The worker's own connection pool per database, kept while the worker lives: a worker runs
 * one export at a time, so it holds one connection, and none once the pool's idle time passes.
 */
const pools = new Map<string, Db>()

function poolFor(database: string, port: number): Db {
  const key = `${port}/${database}`
  let db = pools.get(key)
  if (!db) {
    db = createDb(database, { port })
    pools.set(key, db)
  }
  return db
}

/**
 * Reads an export's readings (or its share of them) from MariaDB, parses their results,
 * computes every cell and, for a CSV, writes the records; posts them to the main thread in
 * batches, never more than BATCHES_AHEAD ahead of it. Runs in a worker thread, so that none of
 * this runs on the API's event loop and a CSV's shares run side by side. Answers the number of
 * rows sent.
 */
export async function exportRows(task: ExportRowTask): Promise<number> {
  const port = task.channel
  try {
    const db = poolFor(task.database, task.databasePort)
    const columns = exportColumns(task.identified)
    const source = await openExportReadingStream(db, task.filter)
    let batch: Cell[][] = []
    let sent = 0
    let ahead = 0
    let stopped = false
    const send = () => {
      port.postMessage(
        (task.format === 'csv'
          ? { type: 'csv', text: stringify(batch, CSV_OPTIONS), rows: batch.length }
          : { type: 'rows', rows: batch }) satisfies ExportRowMessage,
      )
      sent += batch.length
      batch = []
      ahead += 1
      if (ahead >= BATCHES_AHEAD) source.pause()
    }
    await new Promise<void>((resolve, reject) => {
      port.on('message', (message: ExportControlMessage) => {
        if (message === 'stop') {
          stopped = true
          source.destroy()
          resolve()
          return
        }
        ahead -= 1
        if (ahead < BATCHES_AHEAD && source.isPaused()) source.resume()
      })
      // Whole readings per batch, so that a reading's rows stay together when shares interleave.
      source.on('data', (reading: ExportReading) => {
        try {
          for (const row of readingRows(columns, reading)) batch.push(row)
          if (batch.length >= ROWS_PER_BATCH) send()
        } catch (error) {
          source.destroy(error as Error)
        }
      })
      source.on('end', () => {
        try {
          if (batch.length > 0) send()
          resolve()
        } catch (error) {
          reject(error)
        }
      })
      source.on('error', reject)
    })
    if (!stopped) port.postMessage({ type: 'end' } satisfies ExportRowMessage)
    return sent
  } finally {
    port.close()
  }
}

/** Nothing: asked of a worker so that it starts and loads this module before an export. */
export function warm(): true {
  return true
}

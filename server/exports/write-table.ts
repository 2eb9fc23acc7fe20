import { once } from 'node:events'
import { PassThrough, Readable, type Writable } from 'node:stream'
import { setImmediate } from 'node:timers/promises'
import { pipeline } from 'node:stream/promises'
import { stringify } from 'csv-stringify'
import { stringify as stringifySync } from 'csv-stringify/sync'
import ExcelJS from 'exceljs'
import type { Cell } from './export-columns'

/** A sheet to write: a header row, then the rows one at a time. */
export interface TableSheet {
  name: string
  headers: string[]
  /** Rows from memory, a generator, or an object stream (piped straight in, with backpressure). */
  rows: AsyncIterable<Cell[]> | Iterable<Cell[]> | Readable
}

/** How every CSV of Endplate writes its cells (numbers as JavaScript prints them). */
export const CSV_OPTIONS = { cast: { number: String } } as const

/**
 * Streams one table as CSV (RFC 4180, UTF-8 with a byte-order mark so spreadsheets read accents
 * right) into `out`; pipeline applies backpressure, so memory stays flat however many rows.
 */
export async function writeCsv(sheet: TableSheet, out: Writable): Promise<void> {
  const stringifier = stringify({ ...CSV_OPTIONS, header: true, columns: sheet.headers, bom: true })
  const rows = sheet.rows instanceof Readable ? sheet.rows : Readable.from(sheet.rows)
  await pipeline(rows, stringifier, out)
}

/**
 * Writes a CSV whose records arrive already written (CSV text, each record ending in a newline,
 * from the same library and options): the byte-order mark and the header here, then the records
 * as they come, with backpressure.
 */
export async function writeCsvRecords(
  headers: string[],
  records: Readable,
  out: Writable,
): Promise<void> {
  out.write(`\ufeff${stringifySync([headers], CSV_OPTIONS)}`)
  await pipeline(records, out)
}

/** Fails once `out` was closed before the end (a download cut short). */
function failIfClosed(out: Writable): void {
  if (out.destroyed) throw new Error('The download was closed before the end.')
}

/** Rows committed between two looks at the download: the zip gets a turn of the event loop. */
const XLSX_ROWS_PER_TURN = 256

/**
 * Streams sheets as one XLSX workbook into `out` with exceljs's streaming writer: each row is
 * committed (written and forgotten) as it comes, inline strings instead of a shared-strings
 * table, no styles. exceljs buffers what it has not zipped yet without asking anyone to wait,
 * so the workbook goes to `out` through a stream of our own: every few hundred rows the zip
 * gets a turn of the event loop, and the rows wait while that stream waits for `out` (a slow
 * download) and stop when `out` closes.
 */
export async function writeXlsx(sheets: TableSheet[], out: Writable): Promise<void> {
  const zipped = new PassThrough()
  const delivered = pipeline(zipped, out)
  // Failures are read from `out` below; this only keeps an early one from going unhandled.
  delivered.catch(() => {})
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({
    stream: zipped,
    useStyles: false,
    useSharedStrings: false,
  })
  for (const sheet of sheets) {
    const worksheet = workbook.addWorksheet(sheet.name)
    worksheet.addRow(sheet.headers).commit()
    // A stream's rows come typed as any; these are rows of cells.
    const rows: AsyncIterable<Cell[]> | Iterable<Cell[]> = sheet.rows
    let count = 0
    for await (const row of rows) {
      worksheet.addRow(row.map((cell) => cell ?? undefined)).commit()
      count += 1
      if (count % XLSX_ROWS_PER_TURN === 0) {
        await setImmediate()
        while (zipped.writableNeedDrain && !out.destroyed) {
          await Promise.race([once(zipped, 'drain'), once(out, 'close')])
        }
        failIfClosed(out)
      }
    }
    worksheet.commit()
  }
  failIfClosed(out)
  await Promise.all([workbook.commit(), delivered])
}

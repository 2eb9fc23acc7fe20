import { once } from 'node:events'
import { Readable, type Writable } from 'node:stream'
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

/** Waits until `out` wants more, and fails if it closed instead (a download cut short). */
async function drainedOrClosed(out: Writable): Promise<void> {
  await Promise.race([once(out, 'drain'), once(out, 'close')])
  if (out.destroyed) throw new Error('The download was closed before the end.')
}

/**
 * Streams sheets as one XLSX workbook into `out` with exceljs's streaming writer: each row is
 * committed (written and forgotten) as it comes, inline strings instead of a shared-strings
 * table, no styles; the producer waits whenever `out` asks it to. Answers the data rows of each
 * sheet.
 */
export async function writeXlsx(sheets: TableSheet[], out: Writable): Promise<number[]> {
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({
    stream: out,
    useStyles: false,
    useSharedStrings: false,
  })
  const counts: number[] = []
  for (const sheet of sheets) {
    const worksheet = workbook.addWorksheet(sheet.name)
    worksheet.addRow(sheet.headers).commit()
    let count = 0
    const rows: AsyncIterable<Cell[]> | Iterable<Cell[]> = sheet.rows
    for await (const row of rows) {
      worksheet.addRow(row.map((cell) => cell ?? undefined)).commit()
      count += 1
      if (out.writableNeedDrain) await drainedOrClosed(out)
    }
    worksheet.commit()
    counts.push(count)
  }
  await workbook.commit()
  return counts
}

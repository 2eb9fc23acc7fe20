import { once } from 'node:events'
import { Readable, type Writable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { stringify } from 'csv-stringify'
import ExcelJS from 'exceljs'
import type { Cell } from './export-columns'

/** A sheet to write: a header row, then the rows one at a time. */
export interface TableSheet {
  name: string
  headers: string[]
  rows: AsyncIterable<Cell[]> | Iterable<Cell[]>
}

/**
 * Streams one table as CSV (RFC 4180, UTF-8 with a byte-order mark so spreadsheets read accents
 * right) into `out`; pipeline applies backpressure, so memory stays flat however many rows.
 * Answers the number of data rows written.
 */
export async function writeCsv(sheet: TableSheet, out: Writable): Promise<number> {
  let count = 0
  async function* counted() {
    for await (const row of sheet.rows) {
      count += 1
      yield row
    }
  }
  await pipeline(
    Readable.from(counted()),
    stringify({ header: true, columns: sheet.headers, bom: true, cast: { number: String } }),
    out,
  )
  return count
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
    for await (const row of sheet.rows) {
      worksheet.addRow(row.map((cell) => cell ?? undefined)).commit()
      count += 1
      if (out.writableNeedDrain) await once(out, 'drain')
    }
    worksheet.commit()
    counts.push(count)
  }
  await workbook.commit()
  return counts
}

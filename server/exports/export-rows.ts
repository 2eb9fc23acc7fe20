import { pipeline, Transform, type Readable } from 'node:stream'
import type { Db } from '../db/knex'
import { openExportReadingStream, type ExportFilter } from '../db/exports'
import { MOTION_SEGMENTS } from '../../shared/types/domain'
import type { Cell, ExportColumn, ExportReading, ExportRowContext } from './export-columns'
import { escapeSpreadsheetText } from './formula-escape'

/** One cell of a row: text escaped against formula injection; numbers and empties as they are. */
function cellOf(column: ExportColumn, context: ExportRowContext): Cell {
  const value = column.value(context)
  return typeof value === 'string' ? escapeSpreadsheetText(value) : value
}

/**
 * The rows of one reading: one per measured segment (cranial to caudal), or one without a
 * segment. The reading's own cells are computed once and copied into each of its rows; only the
 * per-segment columns are computed per row.
 */
export function readingRows(columns: ExportColumn[], reading: ExportReading): Cell[][] {
  const shared = columns.map((column) => cellOf(column, { reading, segment: null }))
  const measured = reading.results?.measurements?.segments ?? {}
  const segments = MOTION_SEGMENTS.filter((segment) => measured[segment] !== undefined)
  if (segments.length === 0) return [shared]
  return segments.map((segment) => {
    const row = shared.slice()
    for (let index = 0; index < columns.length; index += 1) {
      const column = columns[index]!
      if (column.perSegment) row[index] = cellOf(column, { reading, segment })
    }
    return row
  })
}

/**
 * One row per reading and measured segment, reading after reading, as an object stream, read in
 * this thread: the reference the worker threads' export is tested against, and the bench's
 * sample rows. Downloads read through export-row-pool.ts.
 */
export async function openMeasurementRowStream(
  db: Db,
  filter: ExportFilter,
  columns: ExportColumn[],
): Promise<Readable> {
  const readings = await openExportReadingStream(db, filter)
  const rows = new Transform({
    objectMode: true,
    transform(reading: ExportReading, _encoding, done) {
      try {
        for (const row of readingRows(columns, reading)) this.push(row)
        done()
      } catch (error) {
        done(error as Error)
      }
    },
  })
  // A failure of the query destroys `rows` with its error, which is how the reader hears of it.
  return pipeline(readings, rows, () => {})
}

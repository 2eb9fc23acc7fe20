import type { Writable } from 'node:stream'
import type { Db } from '../db/knex'
import { findStudy } from '../db/studies'
import { countExportRows, streamExportReadings, type ExportFilter } from '../db/exports'
import { forbidden, notFound } from '../errors'
import {
  exportColumns,
  type Cell,
  type ExportColumn,
  type ExportReading,
  type ExportRowContext,
} from '../exports/export-columns'
import { dataDictionaryRows, DATA_DICTIONARY_HEADERS } from '../exports/data-dictionary'
import { escapeSpreadsheetText } from '../exports/formula-escape'
import { writeCsv, writeXlsx, type TableSheet } from '../exports/write-table'
import type { MeasurementExportQuery } from '../schemas/exports'
import { MOTION_SEGMENTS } from '../../shared/types/domain'
import { actorIdentifies, audit, type Actor } from './audit'

export type ExportFormat = 'csv' | 'xlsx'

/** What one export will contain, settled before the first byte is sent. */
export interface PreparedExport {
  filter: ExportFilter
  columns: ExportColumn[]
  identified: boolean
  /** The filter in words, for the audit trail and the file name. */
  description: string
  fileStem: string
}

/**
 * Checks what the actor may export: researchers get de-identified columns only and the studies
 * they belong to; identified columns are for clinicians who ask for them.
 */
export async function prepareMeasurementExport(
  db: Db,
  actor: Actor,
  query: MeasurementExportQuery,
): Promise<PreparedExport> {
  const identified = query.identified === true
  if (identified && !actorIdentifies(actor)) {
    throw forbidden('Your role receives de-identified exports only.')
  }
  const researcherId = actor.user.role === 'researcher' ? actor.user.id : undefined
  if (query.studyId !== undefined && !(await findStudy(db, query.studyId, researcherId))) {
    throw notFound('study')
  }
  const parts = [
    query.studyId === undefined ? 'all studies' : `study ${query.studyId}`,
    query.visitKind?.length ? `visit kind ${query.visitKind.join('/')}` : null,
    query.template?.length ? `template ${query.template.join('/')}` : null,
    query.status?.length ? `status ${query.status.join('/')}` : null,
    identified ? 'identified columns' : 'de-identified',
  ].filter(Boolean)
  return {
    filter: {
      studyId: query.studyId,
      researcherId,
      visitKinds: query.visitKind,
      templates: query.template,
      statuses: query.status,
    },
    columns: exportColumns(identified),
    identified,
    description: parts.join(', '),
    fileStem: `endplate-measurements-${query.studyId === undefined ? 'all' : `study-${query.studyId}`}`,
  }
}

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

/** One row per reading and measured segment, reading after reading. */
export async function* measurementRows(db: Db, prepared: PreparedExport): AsyncGenerator<Cell[]> {
  for await (const reading of streamExportReadings(db, prepared.filter)) {
    for (const row of readingRows(prepared.columns, reading)) yield row
  }
}

function dictionarySheet(columns: ExportColumn[]): TableSheet {
  return {
    name: 'Data dictionary',
    headers: DATA_DICTIONARY_HEADERS,
    rows: dataDictionaryRows(columns).map((row) => row.map((cell) => escapeSpreadsheetText(cell))),
  }
}

/** Writes the export and audits it with its filter and row count, also when it fails midway. */
export async function writeMeasurementExport(
  db: Db,
  actor: Actor,
  prepared: PreparedExport,
  format: ExportFormat,
  out: Writable,
): Promise<number> {
  let rows = 0
  const sheet: TableSheet = {
    name: 'Measurements',
    headers: prepared.columns.map((column) => column.header),
    rows: (async function* counted() {
      for await (const row of measurementRows(db, prepared)) {
        rows += 1
        yield row
      }
    })(),
  }
  let failure: unknown
  try {
    if (format === 'csv') await writeCsv(sheet, out)
    else await writeXlsx([sheet, dictionarySheet(prepared.columns)], out)
  } catch (error) {
    failure = error
  }
  const outcome = failure === undefined ? '' : ' (stopped before the end)'
  await audit(
    db,
    actor,
    'export',
    'measurements',
    prepared.filter.studyId ?? null,
    `Exported ${rows} measurement rows as ${format.toUpperCase()}${outcome}: ${prepared.description}`,
  )
  if (failure !== undefined) throw failure
  return rows
}

/** The data dictionary of the columns the actor's export has (a sheet, ready to write). */
export function dataDictionaryFor(actor: Actor, identified: boolean): TableSheet {
  if (identified && !actorIdentifies(actor)) {
    throw forbidden('Your role receives de-identified exports only.')
  }
  return dictionarySheet(exportColumns(identified))
}

/** How many readings and rows an export will hold, so a download can show its progress. */
export async function countMeasurementExport(
  db: Db,
  prepared: PreparedExport,
): Promise<{ readings: number; rows: number }> {
  return countExportRows(db, prepared.filter)
}

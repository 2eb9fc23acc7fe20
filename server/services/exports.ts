import type { Writable } from 'node:stream'
import type { Db } from '../db/knex'
import { findStudy } from '../db/studies'
import { countExportRows, type ExportFilter } from '../db/exports'
import { openCsvRecordStreamInWorkers, openRowStreamInWorker } from '../exports/export-row-pool'
import { forbidden, notFound } from '../errors'
import { exportColumns, type ExportColumn } from '../exports/export-columns'
import { dataDictionaryRows, DATA_DICTIONARY_HEADERS } from '../exports/data-dictionary'
import { escapeSpreadsheetText } from '../exports/formula-escape'
import { writeCsvRecords, writeXlsx, type TableSheet } from '../exports/write-table'
import type { MeasurementExportQuery } from '../schemas/exports'
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
  const counted = (count: number) => {
    rows += count
  }
  const headers = prepared.columns.map((column) => column.header)
  const { filter, identified } = prepared
  // Read and computed in worker threads: CSV records by one worker per core, each taking a
  // share of the films; XLSX rows by one worker while exceljs writes here.
  const source =
    format === 'csv'
      ? openCsvRecordStreamInWorkers(db, filter, identified, counted)
      : openRowStreamInWorker(db, filter, identified, counted)
  let failure: unknown
  try {
    if (format === 'csv') await writeCsvRecords(headers, source, out)
    else {
      const sheets = [
        { name: 'Measurements', headers, rows: source },
        dictionarySheet(prepared.columns),
      ]
      await writeXlsx(sheets, out)
    }
  } catch (error) {
    failure = error
  } finally {
    // Stops the workers' queries when the download ended early; nothing after a complete one.
    source.destroy()
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

import type { ReadingStatus, ReadingTemplate, VisitKind } from './domain'

/** Filters of a measurement export; empty lists mean "all". */
export interface MeasurementExportFilter {
  studyId?: number
  visitKinds?: VisitKind[]
  templates?: ReadingTemplate[]
  statuses?: ReadingStatus[]
  /** Names, record numbers and dates as extra columns (clinicians only). */
  identified?: boolean
}

export type ExportFileFormat = 'csv' | 'xlsx'

/** What an export will hold, asked before downloading so progress can be shown. */
export interface ExportSize {
  readings: number
  rows: number
}

import type { ExportColumn } from './export-columns'

export const DATA_DICTIONARY_HEADERS = ['column', 'unit', 'type', 'definition', 'source']

const TYPE_WORDS: Record<ExportColumn['kind'], string> = {
  text: 'text',
  number: 'number',
  integer: 'whole number',
}

/** One row per export column: its header, unit, type, definition and source. */
export function dataDictionaryRows(columns: ExportColumn[]): string[][] {
  return columns.map((column) => [
    column.header,
    column.unit ?? '',
    TYPE_WORDS[column.kind],
    column.identified ? `${column.definition} (identifying: clinicians only)` : column.definition,
    column.source,
  ])
}

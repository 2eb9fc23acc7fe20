import type { ExportFileFormat, ExportSize, MeasurementExportFilter } from '@shared/types/exports'
import { ApiError, http, queryString } from './http'

const BASE = import.meta.env.VITE_API_BASE ?? '/api'

function exportQuery(filter: MeasurementExportFilter): string {
  return queryString({
    studyId: filter.studyId,
    visitKind: filter.visitKinds?.join(',') || undefined,
    template: filter.templates?.join(',') || undefined,
    status: filter.statuses?.join(',') || undefined,
    identified: filter.identified ? 'true' : undefined,
  })
}

export const countMeasurementExport = (filter: MeasurementExportFilter) =>
  http.get<ExportSize>(`/exports/measurements/count${exportQuery(filter)}`)

export interface DownloadProgress {
  bytes: number
  /** Data rows received so far (CSV only: its lines can be counted as they arrive). */
  rows: number | null
}

export interface DownloadedFile {
  blob: Blob
  fileName: string
}

/**
 * Downloads an export as a stream, reporting bytes (and CSV rows) as they arrive, so a long
 * export shows its progress; the caller saves the blob.
 */
export async function downloadExport(
  path: string,
  onProgress: (progress: DownloadProgress) => void,
  signal?: AbortSignal,
): Promise<DownloadedFile> {
  let response: Response
  try {
    response = await fetch(`${BASE}${path}`, { credentials: 'same-origin', signal })
  } catch (error) {
    if (signal?.aborted) throw error
    throw new ApiError(
      0,
      'offline',
      'The server cannot be reached. Check the connection and try again.',
    )
  }
  if (!response.ok || !response.body) {
    const body = await response.json().catch(() => undefined)
    throw new ApiError(
      response.status,
      body?.error?.code ?? 'http_error',
      body?.error?.message ?? `The server answered ${response.status}.`,
      body?.error?.details,
    )
  }
  const countRows = (response.headers.get('content-type') ?? '').startsWith('text/csv')
  const reader = response.body.getReader()
  const chunks: Uint8Array<ArrayBuffer>[] = []
  let bytes = 0
  let newlines = 0
  for (;;) {
    const { done, value } = await reader.read()
    if (done) break
    chunks.push(value as Uint8Array<ArrayBuffer>)
    bytes += value.byteLength
    if (countRows) for (const byte of value) if (byte === 10) newlines += 1
    // The header line is not a data row.
    onProgress({ bytes, rows: countRows ? Math.max(0, newlines - 1) : null })
  }
  const disposition = response.headers.get('content-disposition') ?? ''
  const fileName = /filename="([^"]+)"/.exec(disposition)?.[1] ?? 'endplate-export'
  return {
    blob: new Blob(chunks, { type: response.headers.get('content-type') ?? undefined }),
    fileName,
  }
}

export const measurementExportPath = (format: ExportFileFormat, filter: MeasurementExportFilter) =>
  `/exports/measurements.${format}${exportQuery(filter)}`

export const dataDictionaryPath = (filter: MeasurementExportFilter) =>
  `/exports/data-dictionary.csv${filter.identified ? '?identified=true' : ''}`

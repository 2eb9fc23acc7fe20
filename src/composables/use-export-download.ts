import { ref } from 'vue'
import type { ExportFileFormat, MeasurementExportFilter } from '@shared/types/exports'
import {
  countMeasurementExport,
  dataDictionaryPath,
  downloadExport,
  measurementExportPath,
} from '@/api/exports'

/** One export download at a time, with its progress and the file saved when it is complete. */
export function useExportDownload() {
  const busy = ref<ExportFileFormat | 'dictionary' | null>(null)
  const expectedRows = ref<number | null>(null)
  const receivedRows = ref<number | null>(null)
  const receivedBytes = ref(0)
  const error = ref<string | null>(null)
  const lastFile = ref<string | null>(null)
  let controller: AbortController | null = null

  function save(blob: Blob, fileName: string): void {
    const url = URL.createObjectURL(blob)
    const link = document.createElement('a')
    link.href = url
    link.download = fileName
    link.click()
    setTimeout(() => URL.revokeObjectURL(url), 10_000)
  }

  async function run(kind: ExportFileFormat | 'dictionary', filter: MeasurementExportFilter) {
    if (busy.value) return
    busy.value = kind
    error.value = null
    receivedBytes.value = 0
    receivedRows.value = null
    expectedRows.value = null
    controller = new AbortController()
    try {
      if (kind !== 'dictionary') expectedRows.value = (await countMeasurementExport(filter)).rows
      const path =
        kind === 'dictionary' ? dataDictionaryPath(filter) : measurementExportPath(kind, filter)
      const file = await downloadExport(
        path,
        (progress) => {
          receivedBytes.value = progress.bytes
          receivedRows.value = progress.rows
        },
        controller.signal,
      )
      save(file.blob, file.fileName)
      lastFile.value = file.fileName
    } catch (caught) {
      if (!controller.signal.aborted)
        error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      busy.value = null
      controller = null
    }
  }

  function cancel(): void {
    controller?.abort()
  }

  return { busy, expectedRows, receivedRows, receivedBytes, error, lastFile, run, cancel }
}

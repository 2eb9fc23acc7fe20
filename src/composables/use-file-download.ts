import { ref } from 'vue'
import { downloadExport } from '@/api/exports'

/** One file download at a time from an API path, with bytes received and the file saved. */
export function useFileDownload() {
  const busy = ref(false)
  const receivedBytes = ref(0)
  const receivedRows = ref<number | null>(null)
  const error = ref<string | null>(null)
  const lastFile = ref<string | null>(null)

  async function run(path: string): Promise<void> {
    if (busy.value) return
    busy.value = true
    error.value = null
    receivedBytes.value = 0
    receivedRows.value = null
    try {
      const file = await downloadExport(path, (progress) => {
        receivedBytes.value = progress.bytes
        receivedRows.value = progress.rows
      })
      const url = URL.createObjectURL(file.blob)
      const link = document.createElement('a')
      link.href = url
      link.download = file.fileName
      link.click()
      setTimeout(() => URL.revokeObjectURL(url), 10_000)
      lastFile.value = file.fileName
    } catch (caught) {
      error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      busy.value = false
    }
  }

  return { busy, receivedBytes, receivedRows, error, lastFile, run }
}

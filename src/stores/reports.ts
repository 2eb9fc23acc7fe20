import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { Report } from '@shared/types/reports'
import { getReadingReport, getVisitReport } from '@/api/reports'
import { ApiError } from '@/api/http'

/** The report on the printable page: a reading's or a visit's, as the server wrote it. */
export const useReportsStore = defineStore('reports', () => {
  const current = ref<Report | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)

  async function load(kind: 'reading' | 'visit', id: number): Promise<void> {
    loading.value = true
    error.value = null
    current.value = null
    try {
      current.value = kind === 'reading' ? await getReadingReport(id) : await getVisitReport(id)
    } catch (caught) {
      error.value =
        caught instanceof ApiError && caught.status === 404
          ? `This ${kind} does not exist or is not in your studies.`
          : caught instanceof Error
            ? caught.message
            : String(caught)
    } finally {
      loading.value = false
    }
  }

  return { current, loading, error, load }
})

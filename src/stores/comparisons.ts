import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { Comparison } from '@shared/types/compare'
import { getComparison } from '@/api/comparisons'
import { ApiError } from '@/api/http'

/** The comparison on screen: two films of one patient and their differences (read only). */
export const useComparisonsStore = defineStore('comparisons', () => {
  const current = ref<Comparison | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)
  let request = 0

  async function load(imageIds: [number, number], readingIds: number[] = []): Promise<void> {
    const token = ++request
    loading.value = true
    error.value = null
    try {
      const comparison = await getComparison(imageIds, readingIds)
      if (token === request) current.value = comparison
    } catch (caught) {
      if (token !== request) return
      current.value = null
      error.value =
        caught instanceof ApiError && caught.status === 404
          ? 'One of these films does not exist or is not in your studies.'
          : caught instanceof Error
            ? caught.message
            : String(caught)
    } finally {
      if (token === request) loading.value = false
    }
  }

  function reset(): void {
    request += 1
    current.value = null
    loading.value = false
    error.value = null
  }

  return { current, loading, error, load, reset }
})

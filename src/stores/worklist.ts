import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { ReadingQuery, ReadingSummary } from '@shared/types/readings'
import { listReadings } from '@/api/readings'

export interface WorklistSection {
  items: ReadingSummary[]
  total: number
  loading: boolean
  error: string | null
}

/** The signed-in user's worklist: one server query per section. */
export const useWorklistStore = defineStore('worklist', () => {
  const sections = ref<Record<string, WorklistSection>>({})

  async function loadSection(id: string, query: ReadingQuery): Promise<void> {
    sections.value[id] ??= { items: [], total: 0, loading: false, error: null }
    // Read back through the reactive map: the object assigned above is the raw one.
    const section = sections.value[id]
    section.loading = true
    try {
      const page = await listReadings(query)
      section.items = page.items
      section.total = page.total
      section.error = null
    } catch (caught) {
      section.error = caught instanceof Error ? caught.message : String(caught)
    } finally {
      section.loading = false
    }
  }

  function reset(): void {
    sections.value = {}
  }

  return { sections, loadSection, reset }
})

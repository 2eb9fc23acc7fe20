import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { Assignment } from '@shared/types/rounds'
import { listAssignments, startAssignment } from '@/api/assignments'

/** The largest page the assignments list answers. */
const PAGE = 100

/** The signed-in rater's blinded assignments, in the order the round gave them. */
export const useAssignmentsStore = defineStore('assignments', () => {
  const items = ref<Assignment[]>([])
  const total = ref(0)
  const loading = ref(false)
  const loaded = ref(false)
  const error = ref<string | null>(null)

  const due = computed(() => items.value.filter((item) => item.status === 'due'))
  const waiting = computed(() => items.value.filter((item) => item.status === 'waiting'))
  const done = computed(() => items.value.filter((item) => item.status === 'done'))

  async function load(): Promise<void> {
    loading.value = true
    error.value = null
    try {
      const all: Assignment[] = []
      for (let offset = 0; ; offset += PAGE) {
        const page = await listAssignments({ status: 'all', offset, limit: PAGE })
        all.push(...page.items)
        total.value = page.total
        if (all.length >= page.total || page.items.length === 0) break
      }
      items.value = all
      loaded.value = true
    } catch (caught) {
      error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      loading.value = false
    }
  }

  /** The assignment's blinded reading, made on first opening (the server answers the same one after). */
  async function start(id: number): Promise<number> {
    const { readingId } = await startAssignment(id)
    items.value = items.value.map((item) => (item.id === id ? { ...item, readingId } : item))
    return readingId
  }

  return { items, total, loading, loaded, error, due, waiting, done, load, start }
})

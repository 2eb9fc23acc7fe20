import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { IdentifiedVisit, Visit, VisitInput, VisitPatch } from '@shared/types/api'
import { createVisit, listVisits, updateVisit } from '@/api/visits'

export const useVisitsStore = defineStore('visits', () => {
  const byPatient = ref<Record<number, Visit[]>>({})
  const loading = ref(false)
  const error = ref<string | null>(null)

  async function loadForPatient(patientId: number): Promise<void> {
    loading.value = true
    error.value = null
    try {
      byPatient.value[patientId] = await listVisits(patientId)
    } catch (caught) {
      error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      loading.value = false
    }
  }

  async function add(patientId: number, input: VisitInput): Promise<IdentifiedVisit> {
    const created = await createVisit(patientId, input)
    await loadForPatient(patientId)
    return created
  }

  async function update(visit: IdentifiedVisit, patch: VisitPatch): Promise<IdentifiedVisit> {
    const updated = await updateVisit(visit.id, patch)
    await loadForPatient(visit.patientId)
    return updated
  }

  return { byPatient, loading, error, loadForPatient, add, update }
})

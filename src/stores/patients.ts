import { ref } from 'vue'
import { defineStore } from 'pinia'
import type {
  IdentifiedPatient,
  Patient,
  PatientInput,
  PatientPatch,
  PatientQuery,
} from '@shared/types/api'
import { createPatient, getPatient, listPatients, updatePatient } from '@/api/patients'

export const usePatientsStore = defineStore('patients', () => {
  const page = ref<Patient[]>([])
  const total = ref(0)
  const query = ref<PatientQuery>({ q: '', sort: 'familyName', order: 'asc', offset: 0, limit: 20 })
  const loading = ref(false)
  const error = ref<string | null>(null)
  const current = ref<Patient | null>(null)

  // Answers can arrive out of order while someone types; only the latest request may win.
  let latestRequest = 0

  async function search(next: Partial<PatientQuery> = {}): Promise<void> {
    query.value = { ...query.value, ...next }
    const requestId = ++latestRequest
    loading.value = true
    error.value = null
    try {
      const result = await listPatients(query.value)
      if (requestId !== latestRequest) return
      page.value = result.items
      total.value = result.total
    } catch (caught) {
      if (requestId === latestRequest)
        error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      if (requestId === latestRequest) loading.value = false
    }
  }

  async function load(id: number): Promise<Patient> {
    current.value = await getPatient(id)
    return current.value
  }

  async function create(input: PatientInput): Promise<IdentifiedPatient> {
    const created = await createPatient(input)
    await search()
    return created
  }

  async function update(id: number, patch: PatientPatch): Promise<IdentifiedPatient> {
    const updated = await updatePatient(id, patch)
    if (current.value?.id === id) current.value = updated
    return updated
  }

  return { page, total, query, loading, error, current, search, load, create, update }
})

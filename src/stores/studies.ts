import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { Patient } from '@shared/types/api'
import type {
  Study,
  StudyInput,
  StudyMember,
  StudyPatch,
  StudyQuery,
  StudySummary,
} from '@shared/types/studies'
import {
  createStudy,
  getStudy,
  listMemberCandidates,
  listPatientCandidates,
  listStudies,
  listStudyPatients,
  setStudyMembers,
  setStudyPatients,
  updateStudy,
} from '@/api/studies'

export const useStudiesStore = defineStore('studies', () => {
  const list = ref<StudySummary[]>([])
  const total = ref(0)
  const query = ref<StudyQuery>({ q: '', offset: 0, limit: 20 })
  const loading = ref(false)
  const error = ref<string | null>(null)

  const current = ref<Study | null>(null)
  const patients = ref<Patient[]>([])
  const patientTotal = ref(0)
  const patientQuery = ref({ q: '', offset: 0, limit: 20 })
  const patientsLoading = ref(false)

  let latestList = 0
  async function search(next: Partial<StudyQuery> = {}): Promise<void> {
    query.value = { ...query.value, ...next }
    const requestId = ++latestList
    loading.value = true
    error.value = null
    try {
      const page = await listStudies(query.value)
      if (requestId !== latestList) return
      list.value = page.items
      total.value = page.total
    } catch (caught) {
      if (requestId === latestList)
        error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      if (requestId === latestList) loading.value = false
    }
  }

  async function load(id: number): Promise<Study> {
    if (current.value?.id !== id) {
      current.value = null
      patients.value = []
      patientQuery.value = { q: '', offset: 0, limit: 20 }
    }
    current.value = await getStudy(id)
    await loadPatients()
    return current.value
  }

  let latestPatients = 0
  async function loadPatients(next: Partial<{ q: string; offset: number; limit: number }> = {}) {
    if (!current.value) return
    patientQuery.value = { ...patientQuery.value, ...next }
    const requestId = ++latestPatients
    patientsLoading.value = true
    try {
      const page = await listStudyPatients(current.value.id, patientQuery.value)
      if (requestId !== latestPatients) return
      patients.value = page.items
      patientTotal.value = page.total
    } finally {
      if (requestId === latestPatients) patientsLoading.value = false
    }
  }

  async function create(input: StudyInput): Promise<Study> {
    const created = await createStudy(input)
    await search()
    return created
  }

  async function update(patch: Omit<StudyPatch, 'version'>): Promise<Study> {
    if (!current.value) throw new Error('No study is open.')
    current.value = await updateStudy(current.value.id, {
      ...patch,
      version: current.value.version,
    })
    return current.value
  }

  async function replacePatients(patientIds: number[]): Promise<Study> {
    if (!current.value) throw new Error('No study is open.')
    current.value = await setStudyPatients(current.value.id, patientIds, current.value.version)
    await loadPatients({ offset: 0 })
    return current.value
  }

  async function addPatients(ids: number[]): Promise<Study> {
    const existing = current.value?.patientIds ?? []
    return replacePatients([...new Set([...existing, ...ids])])
  }

  async function removePatient(id: number): Promise<Study> {
    return replacePatients(
      (current.value?.patientIds ?? []).filter((patientId) => patientId !== id),
    )
  }

  async function replaceMembers(userIds: number[]): Promise<Study> {
    if (!current.value) throw new Error('No study is open.')
    current.value = await setStudyMembers(current.value.id, userIds, current.value.version)
    return current.value
  }

  async function findPatientCandidates(q: string): Promise<Patient[]> {
    return (await listPatientCandidates({ q, limit: 20 })).items
  }

  async function researchers(): Promise<StudyMember[]> {
    return (await listMemberCandidates()).items
  }

  return {
    list,
    total,
    query,
    loading,
    error,
    current,
    patients,
    patientTotal,
    patientQuery,
    patientsLoading,
    search,
    load,
    loadPatients,
    create,
    update,
    addPatients,
    removePatient,
    replaceMembers,
    findPatientCandidates,
    researchers,
  }
})

import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import type { Study } from '../../../shared/types/studies'
import * as studiesApi from '../../../src/api/studies'
import { useStudiesStore } from '../../../src/stores/studies'

vi.mock('@/api/studies')
const api = vi.mocked(studiesApi)

function study(overrides: Partial<Study> = {}): Study {
  return {
    id: 4,
    name: 'Invented cohort',
    description: null,
    note: null,
    patientCount: 2,
    filmCount: 0,
    heldBackFilmCount: 0,
    readingCount: 0,
    memberCount: 0,
    version: 3,
    createdAt: '2026-01-01T00:00:00.000Z',
    updatedAt: '2026-01-01T00:00:00.000Z',
    members: [],
    patientIds: [10, 11],
    ...overrides,
  }
}

beforeEach(() => {
  setActivePinia(createPinia())
  vi.resetAllMocks()
  api.getStudy.mockResolvedValue(study())
  api.listStudyPatients.mockResolvedValue({ items: [], total: 0 })
})

describe('studies store', () => {
  it('adds patients by sending the whole set with the version it last read', async () => {
    const store = useStudiesStore()
    await store.load(4)
    api.setStudyPatients.mockResolvedValue(study({ patientIds: [10, 11, 12], version: 4 }))
    await store.addPatients([11, 12])
    expect(api.setStudyPatients).toHaveBeenCalledWith(4, [10, 11, 12], 3)
    expect(store.current?.version).toBe(4)
    // The patient list is reloaded from its first page.
    expect(api.listStudyPatients).toHaveBeenLastCalledWith(4, { q: '', offset: 0, limit: 20 })
  })

  it('removes one patient and keeps the others', async () => {
    const store = useStudiesStore()
    await store.load(4)
    api.setStudyPatients.mockResolvedValue(study({ patientIds: [11], version: 4 }))
    await store.removePatient(10)
    expect(api.setStudyPatients).toHaveBeenCalledWith(4, [11], 3)
  })

  it('keeps the study as it was when the server refuses a stale version', async () => {
    const store = useStudiesStore()
    await store.load(4)
    api.setStudyMembers.mockRejectedValue(new Error('Someone else changed this study'))
    await expect(store.replaceMembers([7])).rejects.toThrow('Someone else changed this study')
    expect(store.current?.version).toBe(3)
    expect(api.setStudyMembers).toHaveBeenCalledWith(4, [7], 3)
  })
})

import type { IdentifiedVisit, Visit, VisitInput, VisitPatch } from '@shared/types/api'
import { http } from './http'

export const listVisits = (patientId: number) => http.get<Visit[]>(`/patients/${patientId}/visits`)
export const createVisit = (patientId: number, input: VisitInput) =>
  http.post<IdentifiedVisit>(`/patients/${patientId}/visits`, input)
export const updateVisit = (id: number, patch: VisitPatch) =>
  http.patch<IdentifiedVisit>(`/visits/${id}`, patch)
export const getVisit = (id: number) => http.get<Visit>(`/visits/${id}`)

import type {
  Page,
  Patient,
  PatientInput,
  PatientPatch,
  PatientQuery,
  IdentifiedPatient,
} from '@shared/types/api'
import { http, queryString } from './http'

export const listPatients = (query: PatientQuery) =>
  http.get<Page<Patient>>(`/patients${queryString({ ...query })}`)
export const getPatient = (id: number) => http.get<Patient>(`/patients/${id}`)
export const createPatient = (input: PatientInput) =>
  http.post<IdentifiedPatient>('/patients', input)
export const updatePatient = (id: number, patch: PatientPatch) =>
  http.patch<IdentifiedPatient>(`/patients/${id}`, patch)

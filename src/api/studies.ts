import type { Page, Patient } from '@shared/types/api'
import type {
  Study,
  StudyInput,
  StudyMember,
  StudyPatch,
  StudyPatientQuery,
  StudyQuery,
  StudySummary,
} from '@shared/types/studies'
import { http, queryString } from './http'

export const listStudies = (query: StudyQuery = {}) =>
  http.get<Page<StudySummary>>(`/studies${queryString({ ...query })}`)
export const getStudy = (id: number) => http.get<Study>(`/studies/${id}`)
export const createStudy = (input: StudyInput) => http.post<Study>('/studies', input)
export const updateStudy = (id: number, patch: StudyPatch) =>
  http.patch<Study>(`/studies/${id}`, patch)
export const listStudyPatients = (id: number, query: StudyPatientQuery = {}) =>
  http.get<Page<Patient>>(`/studies/${id}/patients${queryString({ ...query })}`)
export const setStudyPatients = (id: number, patientIds: number[], version: number) =>
  http.put<Study>(`/studies/${id}/patients`, { patientIds, version })
export const setStudyMembers = (id: number, userIds: number[], version: number) =>
  http.put<Study>(`/studies/${id}/members`, { userIds, version })
export const listPatientCandidates = (query: StudyPatientQuery) =>
  http.get<Page<Patient>>(`/studies/patient-candidates${queryString({ ...query })}`)
export const listMemberCandidates = () => http.get<Page<StudyMember>>('/studies/member-candidates')

import type { Page } from '@shared/types/api'
import type { Assignment, AssignmentFilm } from '@shared/types/rounds'
import { http, queryString } from './http'

export type AssignmentFilter = 'due' | 'done' | 'all'

export const listAssignments = (
  query: { status?: AssignmentFilter; limit?: number; offset?: number } = {},
) => http.get<Page<Assignment>>(`/assignments${queryString({ ...query })}`)
export const startAssignment = (id: number) =>
  http.post<{ readingId: number }>(`/assignments/${id}/start`)
export const getAssignmentFilm = (id: number) =>
  http.get<AssignmentFilm>(`/assignments/${id}/film.json`)

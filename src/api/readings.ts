import type { CreateReadingInput, PatchReadingInput, Reading } from '@shared/types/readings'
import { http } from './http'

export const createReading = (imageId: number, input: CreateReadingInput) =>
  http.post<Reading>(`/images/${imageId}/readings`, input)
export const getReading = (id: number) => http.get<Reading>(`/readings/${id}`)
export const listImageReadings = (imageId: number) =>
  http.get<Reading[]>(`/images/${imageId}/readings`)
/** A stale `version` answers 409; the caller then loads the current reading. */
export const patchReading = (id: number, input: PatchReadingInput) =>
  http.patch<Reading>(`/readings/${id}`, input)
export const submitReading = (id: number, version: number) =>
  http.post<Reading>(`/readings/${id}/submit`, { version })

import type { Page } from '@shared/types/api'
import type {
  AmendmentInput,
  CommentInput,
  CreateReadingInput,
  PatchReadingInput,
  Reading,
  ReadingComment,
  ReadingQuery,
  ReadingSummary,
  ReturnReadingInput,
} from '@shared/types/readings'
import { http, queryString } from './http'

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

/** Worklists and patient pages: filtered, sorted and paged on the server. */
export const listReadings = (query: ReadingQuery) =>
  http.get<Page<ReadingSummary>>(
    `/readings${queryString({ ...query, status: query.status?.join(',') })}`,
  )
export const signReading = (id: number, version: number) =>
  http.post<Reading>(`/readings/${id}/sign`, { version })
export const returnReading = (id: number, input: ReturnReadingInput) =>
  http.post<Reading>(`/readings/${id}/return`, input)
/** A new draft with the signed reading's landmarks that supersedes it once signed. */
export const amendReading = (id: number, input: AmendmentInput) =>
  http.post<Reading>(`/readings/${id}/amendments`, input)
export const listReadingComments = (id: number) =>
  http.get<ReadingComment[]>(`/readings/${id}/comments`)
export const addReadingComment = (id: number, input: CommentInput) =>
  http.post<ReadingComment>(`/readings/${id}/comments`, input)

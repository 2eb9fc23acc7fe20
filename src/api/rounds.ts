import type { Page } from '@shared/types/api'
import type {
  CreateRoundInput,
  RoundDetail,
  RoundPatch,
  RoundResults,
  RoundSummary,
} from '@shared/types/rounds'
import type { RoundFilmCandidate } from '@shared/types/round-films'
import type { RoundRaterCandidate } from '@shared/types/round-raters'
import { http, queryString } from './http'

export const listStudyRounds = (studyId: number, query: { limit?: number; offset?: number } = {}) =>
  http.get<Page<RoundSummary>>(`/studies/${studyId}/rounds${queryString({ ...query })}`)
export const createRound = (studyId: number, input: CreateRoundInput) =>
  http.post<RoundSummary>(`/studies/${studyId}/rounds`, input)
export const getRound = (id: number) => http.get<RoundDetail>(`/rounds/${id}`)
export const patchRound = (id: number, patch: RoundPatch) =>
  http.patch<RoundSummary>(`/rounds/${id}`, patch)
export const getRoundResults = (id: number) => http.get<RoundResults>(`/rounds/${id}/results`)
export const roundResultsCsvPath = (id: number) => `/rounds/${id}/results.csv`
export const listRaterCandidates = () =>
  http.get<Page<RoundRaterCandidate>>('/rounds/rater-candidates')
export const listRoundFilmCandidates = (studyId: number) =>
  http.get<Page<RoundFilmCandidate>>(`/studies/${studyId}/round-film-candidates`)

import type { ApiErrorBody } from '@shared/types/api'
import type { MotionSegment } from '@shared/types/domain'
import type { PatientPlan, PatientTrends, PlanSegmentInput } from '@shared/types/plans'
import { ApiError, http } from './http'

const BASE = import.meta.env.VITE_API_BASE ?? '/api'

/**
 * The shared client has no PUT yet; this mirrors its error handling for the one PUT the plan
 * needs, and should move into http.ts once it offers `put`.
 */
async function put<T>(path: string, body: unknown): Promise<T> {
  let response: Response
  try {
    response = await fetch(`${BASE}${path}`, {
      method: 'PUT',
      credentials: 'same-origin',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify(body),
    })
  } catch {
    throw new ApiError(
      0,
      'offline',
      'The server cannot be reached. Check the connection and try again.',
    )
  }
  const text = await response.text()
  const parsed: unknown = text ? JSON.parse(text) : undefined
  if (!response.ok) {
    const error = (parsed as ApiErrorBody | undefined)?.error
    throw new ApiError(
      response.status,
      error?.code ?? 'http_error',
      error?.message ?? `The server answered ${response.status}.`,
      error?.details,
    )
  }
  return parsed as T
}

export const getPlan = (patientId: number) => http.get<PatientPlan>(`/patients/${patientId}/plan`)
/** Answers the whole plan again (checks and the lordosis estimate depend on every segment). */
export const savePlanSegment = (
  patientId: number,
  segment: MotionSegment,
  input: PlanSegmentInput,
) => put<PatientPlan>(`/patients/${patientId}/plan/${segment}`, input)
export const getTrends = (patientId: number) =>
  http.get<PatientTrends>(`/patients/${patientId}/trends`)

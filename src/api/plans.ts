import type { MotionSegment } from '@shared/types/domain'
import type { PatientPlan, PatientTrends, PlanSegmentInput } from '@shared/types/plans'
import { http } from './http'

export const getPlan = (patientId: number) => http.get<PatientPlan>(`/patients/${patientId}/plan`)
/** Answers the whole plan again (checks and the lordosis estimate depend on every segment). */
export const savePlanSegment = (
  patientId: number,
  segment: MotionSegment,
  input: PlanSegmentInput,
) => http.put<PatientPlan>(`/patients/${patientId}/plan/${segment}`, input)
export const getTrends = (patientId: number) =>
  http.get<PatientTrends>(`/patients/${patientId}/trends`)

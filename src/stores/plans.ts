import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { MotionSegment } from '@shared/types/domain'
import type { PatientPlan, PatientTrends, PlanSegmentInput } from '@shared/types/plans'
import { getPlan, getTrends, savePlanSegment } from '@/api/plans'

/** A patient's plan and the trends of their measures across visits (trends follow the plan). */
export const usePlansStore = defineStore('plans', () => {
  const plans = ref<Record<number, PatientPlan>>({})
  const trends = ref<Record<number, PatientTrends>>({})
  const planError = ref<string | null>(null)
  const trendsError = ref<string | null>(null)

  const message = (caught: unknown) => (caught instanceof Error ? caught.message : String(caught))

  async function loadPlan(patientId: number): Promise<void> {
    planError.value = null
    try {
      plans.value[patientId] = await getPlan(patientId)
    } catch (caught) {
      planError.value = message(caught)
    }
  }

  async function loadTrends(patientId: number): Promise<void> {
    trendsError.value = null
    try {
      trends.value[patientId] = await getTrends(patientId)
    } catch (caught) {
      trendsError.value = message(caught)
    }
  }

  /** Throws the ApiError (409 on a stale version) so the caller can say what happened. */
  async function saveSegment(
    patientId: number,
    segment: MotionSegment,
    input: PlanSegmentInput,
  ): Promise<void> {
    plans.value[patientId] = await savePlanSegment(patientId, segment, input)
    // The treated segments decide which trend series exist.
    await loadTrends(patientId)
  }

  return { plans, trends, planError, trendsError, loadPlan, loadTrends, saveSegment }
})

import type { FilmMeasures, PlanAchievedRow } from '../types/compare'
import type { SegmentName } from '../types/measurement'
import { IMPLANT_TREATMENTS, type PatientPlan } from '../types/plans'
import { SOURCES } from '../measurement/sources'
import { valueWithInterval } from './difference-interval'

const TREATMENT_WORDS: Record<string, string> = {
  'disc-replacement': 'disc replacement',
  'interbody-fusion': 'interbody fusion',
  'posterior-fusion': 'posterior fusion',
}

function row(base: Omit<PlanAchievedRow, 'differenceDeg'>): PlanAchievedRow {
  return {
    ...base,
    differenceDeg:
      base.planned === null || base.achieved === null ? null : base.achieved.value - base.planned,
  }
}

/**
 * The plan beside what a film after surgery achieved, degrees: at each segment planned for an
 * implant, the planned implant lordosis against the segmental lordosis measured (Cobb method);
 * for the lumbar spine, the target lordosis from pelvic incidence (0.54·PI + 27.6, Le Huec &
 * Hasegawa 2016) and the lordosis the plan expected (an estimate) against the L1–S1 lordosis
 * measured. `differenceDeg` = achieved − planned. A measure the film lacks is null.
 */
export function planAchievedRows(plan: PatientPlan, after: FilmMeasures | null): PlanAchievedRow[] {
  const rows: PlanAchievedRow[] = []
  for (const planned of plan.segments) {
    if (!IMPLANT_TREATMENTS.includes(planned.treatment)) continue
    const segment = planned.segment as SegmentName
    rows.push(
      row({
        id: `${segment}-implant-lordosis`,
        segment,
        label: `${segment} ${TREATMENT_WORDS[planned.treatment] ?? planned.treatment}`,
        planned: planned.implantLordosisDeg,
        plannedLabel: 'planned implant lordosis',
        achieved: valueWithInterval(
          after?.measurements.segments[segment]?.segmentalLordosisDeg,
          after?.uncertainty?.measurements.segments[segment]?.segmentalLordosisDeg,
        ),
        achievedLabel: 'segmental lordosis measured',
        source: SOURCES.segmentalLordosis,
      }),
    )
  }
  if (rows.length === 0) return rows
  const lordosis = valueWithInterval(
    after?.measurements.lumbarLordosisDeg,
    after?.uncertainty?.measurements.lumbarLordosisDeg,
  )
  rows.push(
    row({
      id: 'target-lordosis',
      segment: null,
      label: 'Lumbar lordosis L1–S1',
      planned: plan.lordosis.targetLordosisDeg,
      plannedLabel: 'target lordosis (0.54·PI + 27.6)',
      achieved: lordosis,
      achievedLabel: 'L1–S1 lordosis measured',
      source: SOURCES.targetLordosis,
    }),
    row({
      id: 'expected-lordosis',
      segment: null,
      label: 'Lumbar lordosis L1–S1',
      planned: plan.lordosis.expectedLordosisDeg,
      plannedLabel: 'lordosis the plan expected (estimate)',
      achieved: lordosis,
      achievedLabel: 'L1–S1 lordosis measured',
      source: SOURCES.plannedLordosis,
    }),
  )
  return rows
}

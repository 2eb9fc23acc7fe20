import type {
  PlanCheckFlag,
  PlannedLordosisEstimate,
  PlannedTreatment,
  SegmentName,
} from '../types/measurement'
import { targetLordosisDeg } from './alignment'
import { roundSlipPercent } from './meyerding'
import { SOURCES } from './sources'

/** Dynamic translation above this (mm) flags a disc replacement: the IDE trial cut-off [V]. */
export const DYNAMIC_TRANSLATION_LIMIT_MM = 5
/** Residual disc height below this (mm) flags a disc replacement; the literature is mixed [V]. */
export const RESIDUAL_DISC_HEIGHT_LIMIT_MM = 3

/**
 * What is known about one segment planned for treatment. A finding left undefined or null was
 * not recorded; its check then reads null (unknown), never false.
 */
export interface SegmentPlanCheckInput {
  treatment: PlannedTreatment
  /** Pars defect (either side) or isthmic spondylolisthesis recorded at the segment. */
  parsDefect?: boolean | null
  /** Measured slip in % (Taillard); graded with the engine's Meyerding rule. */
  slipPercent?: number | null
  facetDegeneration?: boolean | null
  /** Translation between flexion and extension films, mm (see computeMotionPair). */
  dynamicTranslationMm?: number | null
  /** Osteoporosis or osteopenia recorded for the patient. */
  osteoporosis?: boolean | null
  /** Residual disc height in mm, e.g. the mean (two-point) height of the segment. */
  residualDiscHeightMm?: number | null
}

function known<T>(value: T | null | undefined): value is T {
  return value !== null && value !== undefined
}

/**
 * Decision-support flags for a segment planned for disc replacement (measurement-reference §9):
 * pars defect or isthmic slip, slip grade II or more (rounded slip > 25 %), facet degeneration,
 * dynamic translation > 5 mm, osteoporosis, residual disc height < 3 mm. Each flag carries its
 * source. Other treatments get no flags (an empty list): the checks concern disc replacement.
 * Pure; never a decision.
 */
export function checkSegmentPlan(input: SegmentPlanCheckInput): PlanCheckFlag[] {
  if (input.treatment !== 'disc replacement') return []
  const { parsDefect, slipPercent, facetDegeneration, dynamicTranslationMm } = input
  const { osteoporosis, residualDiscHeightMm } = input
  return [
    {
      id: 'pars-defect',
      label: 'pars defect or isthmic spondylolisthesis at a disc replacement level',
      flagged: known(parsDefect) ? parsDefect : null,
      source: SOURCES.parsDefect,
    },
    {
      id: 'slip-grade-ii-or-more',
      label: 'slip of Meyerding grade II or more at a disc replacement level',
      flagged: known(slipPercent) ? roundSlipPercent(slipPercent) > 25 : null,
      source: SOURCES.slipGrade,
    },
    {
      id: 'facet-degeneration',
      label: 'facet joint degeneration at a disc replacement level',
      flagged: known(facetDegeneration) ? facetDegeneration : null,
      source: SOURCES.facetDegeneration,
    },
    {
      id: 'dynamic-translation-over-5mm',
      label: 'dynamic translation over 5 mm at a disc replacement level',
      flagged: known(dynamicTranslationMm)
        ? dynamicTranslationMm > DYNAMIC_TRANSLATION_LIMIT_MM
        : null,
      source: SOURCES.ideTranslation,
    },
    {
      id: 'osteoporosis',
      label: 'osteoporosis recorded for a disc replacement',
      flagged: known(osteoporosis) ? osteoporosis : null,
      source: SOURCES.osteoporosis,
    },
    {
      id: 'residual-disc-height-under-3mm',
      label: 'residual disc height under 3 mm at a disc replacement level',
      flagged: known(residualDiscHeightMm)
        ? residualDiscHeightMm < RESIDUAL_DISC_HEIGHT_LIMIT_MM
        : null,
      source: SOURCES.residualDiscHeight,
    },
  ]
}

/** Treatments whose planned implant angle sets the segment's angle after surgery. */
const FUSING_TREATMENTS: ReadonlySet<PlannedTreatment> = new Set([
  'interbody fusion',
  'posterior fusion',
])

export interface PlannedSegment {
  segment: SegmentName
  treatment: PlannedTreatment
  /** Lordotic angle of the planned implant in degrees; null when none is planned. */
  plannedImplantAngleDeg: number | null
  /** Current segmental lordosis in degrees (computeMeasurements). */
  currentSegmentalLordosisDeg: number | null
}

export interface PlannedLordosisInput {
  /** Current L1–S1 lordosis in degrees. */
  currentLordosisDeg: number | null
  pelvicIncidenceDeg: number | null
  segments: readonly PlannedSegment[]
}

/**
 * The plan's expected L1–S1 lordosis beside the target (measurement-reference §9): current
 * lordosis + Σ(planned implant angle − current segmental angle) over fused segments that have a
 * planned implant angle; target = 0.54·PI + 27.6 (Le Huec & Hasegawa 2016 [V]). Degrees,
 * lordosis positive. This is an estimate [D]: it assumes the rest of the spine does not change.
 * Expected is null when the current lordosis, or a fused segment's current angle, is missing.
 */
export function estimatePlannedLordosis(input: PlannedLordosisInput): PlannedLordosisEstimate {
  let expected = input.currentLordosisDeg
  for (const planned of input.segments) {
    if (!FUSING_TREATMENTS.has(planned.treatment) || planned.plannedImplantAngleDeg === null) {
      continue
    }
    expected =
      expected === null || planned.currentSegmentalLordosisDeg === null
        ? null
        : expected + planned.plannedImplantAngleDeg - planned.currentSegmentalLordosisDeg
  }
  const target =
    input.pelvicIncidenceDeg === null ? null : targetLordosisDeg(input.pelvicIncidenceDeg)
  return {
    expectedLordosisDeg: expected,
    targetLordosisDeg: target,
    differenceDeg: expected === null || target === null ? null : expected - target,
    isEstimate: true,
    source: `${SOURCES.plannedLordosis}; target: ${SOURCES.targetLordosis}`,
  }
}

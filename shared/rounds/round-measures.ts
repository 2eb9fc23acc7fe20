/**
 * The measures a re-reading round's reliability is reported for, and where each sits in a
 * reading's results. Pure functions over the engine's MeasurementResult.
 */
import { MOTION_SEGMENTS, type MotionSegment } from '../types/domain'
import type { MeasurementResult, MeyerdingGrade, SegmentMeasurement } from '../types/measurement'
import type { RoundTemplate, RoundTemplateOptions } from '../types/rounds'

export interface RoundMeasure {
  key: string
  label: string
  unit: string
  /** The value in `unit`, or null when the reading could not compute it. */
  valueOf: (result: MeasurementResult) => number | null
}

/** Meyerding grades in scale order (Meyerding 1932); 0 stands for no forward slip. */
export const MEYERDING_CATEGORIES = [0, 1, 2, 3, 4, 5] as const

const GRADE_NUMBER: Record<MeyerdingGrade, number> = { I: 1, II: 2, III: 3, IV: 4, V: 5 }

/** The grade of a segment as a number on the scale 0–5 (0: no anterolisthesis), or null. */
export function meyerdingCategory(
  result: MeasurementResult,
  segment: MotionSegment,
): number | null {
  const measured = result.segments[segment]
  if (!measured || measured.slipPercent === null) return null
  if (measured.meyerdingGrade === null) return 0
  return GRADE_NUMBER[measured.meyerdingGrade]
}

function segmentMeasures(segment: MotionSegment): RoundMeasure[] {
  const of =
    (pick: (measured: SegmentMeasurement) => number | null | undefined) =>
    (result: MeasurementResult) => {
      const measured = result.segments[segment]
      return measured ? (pick(measured) ?? null) : null
    }
  const measures: RoundMeasure[] = [
    {
      key: `${segment}.slipPercent`,
      label: `${segment} slip`,
      unit: '%',
      valueOf: of((m) => m.slipPercent),
    },
    {
      key: `${segment}.segmentalLordosisDeg`,
      label: `${segment} segmental lordosis`,
      unit: '°',
      valueOf: of((m) => m.segmentalLordosisDeg),
    },
    {
      key: `${segment}.discHeightAnteriorMm`,
      label: `${segment} anterior disc height`,
      unit: 'mm',
      valueOf: of((m) => m.discHeightMm?.anterior),
    },
    {
      key: `${segment}.discHeightMiddleMm`,
      label: `${segment} middle disc height`,
      unit: 'mm',
      valueOf: of((m) => m.discHeightMm?.middle),
    },
    {
      key: `${segment}.discHeightPosteriorMm`,
      label: `${segment} posterior disc height`,
      unit: 'mm',
      valueOf: of((m) => m.discHeightMm?.posterior),
    },
  ]
  // Boxall's slip angle is defined at the lumbosacral segment only.
  if (segment === 'L5-S1') {
    measures.splice(1, 0, {
      key: `${segment}.slipAngleDeg`,
      label: `${segment} slip angle`,
      unit: '°',
      valueOf: of((m) => m.slipAngleDeg),
    })
  }
  return measures
}

const SPINOPELVIC: RoundMeasure[] = [
  {
    key: 'L1-S1.lordosisDeg',
    label: 'L1–S1 lordosis',
    unit: '°',
    valueOf: (result) => result.lumbarLordosisDeg,
  },
  {
    key: 'PI',
    label: 'Pelvic incidence',
    unit: '°',
    valueOf: (r) => r.pelvis?.incidenceDeg ?? null,
  },
  { key: 'PT', label: 'Pelvic tilt', unit: '°', valueOf: (r) => r.pelvis?.tiltDeg ?? null },
  { key: 'SS', label: 'Sacral slope', unit: '°', valueOf: (r) => r.pelvis?.sacralSlopeDeg ?? null },
]

/** The segments a round's template reads. */
export function roundSegments(
  template: RoundTemplate,
  options: RoundTemplateOptions,
): MotionSegment[] {
  return template === 'slip-grade' ? [options.segment ?? 'L5-S1'] : [...MOTION_SEGMENTS]
}

/** Every continuous measure of a round's template, segments first (cranial to caudal). */
export function roundMeasures(
  template: RoundTemplate,
  options: RoundTemplateOptions,
): RoundMeasure[] {
  const segments = roundSegments(template, options).flatMap(segmentMeasures)
  return template === 'slip-grade' ? segments : [...segments, ...SPINOPELVIC]
}

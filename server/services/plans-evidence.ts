import type { PatientReadingSummary } from '../db/plans'
import type { MotionSegment } from '../../shared/types/domain'
import type { SegmentMeasurement } from '../../shared/types/measurement'
import type { MeasuredValue, MeasureSource, SegmentEvidence } from '../../shared/types/plans'
import { COUNTED_STATUSES } from '../../shared/readings/reading-status'

/** Templates whose neutral-film measurements describe a segment's shape before surgery. */
const SHAPE_TEMPLATES = new Set(['slip-grade', 'lumbar-alignment'])

export const EVIDENCE_NOTE =
  'Measured values come from the latest submitted or signed pre-op readings (drafts are never used): ' +
  'slip, disc height and segmental lordosis from slip-grade or lumbar-alignment readings, translation ' +
  'from motion-pair readings, L1–S1 lordosis and PI from lumbar-alignment readings.'

export function sourceOf(reading: PatientReadingSummary, withCalibration: boolean): MeasureSource {
  return {
    readingId: reading.id,
    template: reading.template,
    status: reading.status,
    visitId: reading.visitId,
    visitKind: reading.visitKind,
    calibrationSource: withCalibration ? reading.calibration.source : null,
  }
}

/** The first reading (readings come newest first) for which `pick` gives a value. */
export function firstMeasured<T>(
  readings: readonly PatientReadingSummary[],
  pick: (reading: PatientReadingSummary) => T | null | undefined,
  withCalibration = false,
): MeasuredValue<T> | null {
  for (const reading of readings) {
    const value = pick(reading)
    if (value !== null && value !== undefined)
      return { ...sourceOf(reading, withCalibration), value }
  }
  return null
}

/** Submitted or signed readings of pre-op visits, newest first. */
export function preOpEvidenceReadings(
  readings: readonly PatientReadingSummary[],
): PatientReadingSummary[] {
  return readings.filter(
    (reading) => reading.visitKind === 'pre-op' && COUNTED_STATUSES.includes(reading.status),
  )
}

/** A slip-grade reading measures its own segment only; a lumbar-alignment reading all five. */
function segmentOf(
  reading: PatientReadingSummary,
  segment: MotionSegment,
): SegmentMeasurement | undefined {
  if (!SHAPE_TEMPLATES.has(reading.template)) return undefined
  if (reading.template === 'slip-grade' && reading.options.segment !== segment) return undefined
  return reading.results?.measurements?.segments?.[segment]
}

export function segmentEvidence(
  preOp: readonly PatientReadingSummary[],
  segment: MotionSegment,
): SegmentEvidence {
  const slip = firstMeasured(preOp, (r) => segmentOf(r, segment)?.slipPercent)
  // The grade is read from the same reading as the slip, so the two never disagree.
  const slipReading = slip ? preOp.find((r) => r.id === slip.readingId) : undefined
  return {
    slipPercent: slip,
    meyerdingGrade: slipReading
      ? {
          ...sourceOf(slipReading, false),
          value: segmentOf(slipReading, segment)?.meyerdingGrade ?? null,
        }
      : null,
    dynamicTranslationMm: firstMeasured(
      preOp.filter((r) => r.template === 'motion-pair'),
      (r) => r.results?.motion?.segments?.[segment]?.translationMm,
      true,
    ),
    residualDiscHeightMm: firstMeasured(
      preOp,
      (r) => segmentOf(r, segment)?.discHeightMm?.mean,
      true,
    ),
    currentSegmentalLordosisDeg: firstMeasured(
      preOp,
      (r) => segmentOf(r, segment)?.segmentalLordosisDeg,
    ),
  }
}

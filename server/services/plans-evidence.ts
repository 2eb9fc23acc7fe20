import type { PatientReadingSummary } from '../db/plans'
import type { MotionSegment } from '../../shared/types/domain'
import type { SegmentMeasurement } from '../../shared/types/measurement'
import type {
  FrontalImplantPosition,
  ImplantPositionEvidence,
  MeasuredValue,
  MeasureSource,
  SegmentEvidence,
} from '../../shared/types/plans'
import { DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM } from '../../shared/measurement/implant-centring'
import { SOURCES } from '../../shared/measurement/sources'

/** Templates whose neutral-film measurements describe a segment's shape before surgery. */
const SHAPE_TEMPLATES = new Set(['slip-grade', 'lumbar-alignment'])

export const EVIDENCE_NOTE =
  'Measured values come from the latest submitted or signed pre-op readings (drafts are never used): ' +
  'slip, disc height and segmental lordosis from slip-grade or lumbar-alignment readings, translation ' +
  'from motion-pair readings, L1–S1 lordosis and PI from lumbar-alignment readings. A disc ' +
  "replacement's position after surgery comes from the latest submitted or signed post-op or " +
  'follow-up readings: construct checks on the lateral film, implant centring on the frontal film.'

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
  return readings.filter((reading) => reading.visitKind === 'pre-op' && reading.status !== 'draft')
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

/** Submitted or signed readings of post-op and follow-up visits, newest first. */
export function postOpEvidenceReadings(
  readings: readonly PatientReadingSummary[],
): PatientReadingSummary[] {
  return readings.filter((reading) => reading.visitKind !== 'pre-op' && reading.status !== 'draft')
}

/** A construct check measures the marker of a segment it lists as a disc replacement. */
function markerOf(
  reading: PatientReadingSummary,
  segment: MotionSegment,
): SegmentMeasurement | undefined {
  if (reading.template !== 'construct-check') return undefined
  const listed = reading.options.construct?.some(
    (entry) => entry.segment === segment && entry.implant === 'disc-replacement',
  )
  return listed ? reading.results?.measurements?.segments?.[segment] : undefined
}

function frontalOf(
  reading: PatientReadingSummary,
  segment: MotionSegment,
): FrontalImplantPosition | undefined {
  if (reading.template !== 'implant-centring') return undefined
  if (!reading.options.discReplacements?.includes(segment)) return undefined
  const measured = reading.results?.measurements?.frontal?.[segment]
  if (!measured || measured.lateralOffsetPercent === null) return undefined
  const centring = reading.results.centring
  return {
    lateralOffsetMm: measured.lateralOffsetMm,
    lateralOffsetPercent: measured.lateralOffsetPercent,
    implantTiltDeg: measured.implantTiltDeg,
    offCentre: centring?.segments[segment]?.offCentre ?? null,
    thresholdMm: centring?.thresholdMm ?? DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
    imageRightSide: centring?.imageRightSide ?? 'unknown',
  }
}

/** Where a disc replacement sits after surgery, on the lateral and the frontal film. */
export function implantPositionEvidence(
  postOp: readonly PatientReadingSummary[],
  segment: MotionSegment,
): ImplantPositionEvidence {
  return {
    lateralPositionPercent: firstMeasured(
      postOp,
      (r) => markerOf(r, segment)?.implantPositionPercent,
    ),
    lateralOffsetMm: firstMeasured(postOp, (r) => markerOf(r, segment)?.implantOffsetMm, true),
    frontal: firstMeasured(postOp, (r) => frontalOf(r, segment), true),
    lateralSource: SOURCES.implantPosition,
    frontalSource: SOURCES.frontalOffset,
  }
}

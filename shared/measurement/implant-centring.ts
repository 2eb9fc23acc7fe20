import type {
  FrontalImageRightSide,
  FrontalSegmentMeasurement,
  ImplantCentringResult,
  MeasurementResult,
  SegmentName,
} from '../types/measurement'
import { SOURCES } from './sources'

/**
 * Default threshold for a disc replacement's lateral offset from the body midline on a frontal
 * film: flagged above 3 mm (McAfee et al. 2005, Spine 30:1576: ideal placement within 3 mm of
 * the midline [M], from memory: verify). A site setting may replace it.
 */
export const DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM = 3

/** Slack (mm) so an offset equal to the threshold up to floating-point error is not flagged. */
const THRESHOLD_SLACK_MM = 1e-9

/**
 * True when |lateral offset| is above `thresholdMm`, false when at or below it, null when the
 * offset has no mm value (no calibration, or the implant ends are not placed).
 */
export function isImplantOffCentre(
  segment: Pick<FrontalSegmentMeasurement, 'lateralOffsetMm'>,
  thresholdMm: number = DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
): boolean | null {
  if (!Number.isFinite(thresholdMm) || thresholdMm < 0) {
    throw new RangeError(`thresholdMm must be a finite number ≥ 0, got ${thresholdMm}`)
  }
  const offset = segment.lateralOffsetMm
  return offset === null ? null : Math.abs(offset) > thresholdMm + THRESHOLD_SLACK_MM
}

export type { FrontalImageRightSide }

/**
 * What the `r` side of a frontal film is in the patient, from DICOM Patient Orientation
 * (0020,0020): its first value is the patient direction of the rows, i.e. toward increasing
 * column index, the image's right edge (DICOM PS3.3 C.7.6.1.1.1); each value is one or more of
 * A, P, R, L, H, F, the first letter the major one. "L" there (the usual AP film, the patient
 * facing the viewer) makes image right the patient's left. Anything else, a missing value, or
 * a first direction that is not left or right (a lateral film), gives 'unknown'.
 */
export function frontalImageRightSide(
  patientOrientation: readonly string[] | null | undefined,
): FrontalImageRightSide {
  const major = patientOrientation?.[0]?.trim().toUpperCase().charAt(0)
  if (major === 'L') return 'patient-left'
  if (major === 'R') return 'patient-right'
  return 'unknown'
}

/** The words for a direction toward the `r` side (positive) or the `l` side (negative). */
export function frontalSideWords(
  side: FrontalImageRightSide,
  toward: 'r' | 'l',
): 'patient left' | 'patient right' | 'image right' | 'image left' {
  if (side === 'unknown') return toward === 'r' ? 'image right' : 'image left'
  const right = side === 'patient-right'
  return (toward === 'r') === right ? 'patient right' : 'patient left'
}

export interface ImplantCentringOptions {
  /** Flag an offset above this many mm; default `DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM`. */
  thresholdMm?: number
  /** What the image's right edge shows; default 'unknown' ("image right"). */
  imageRightSide?: FrontalImageRightSide
}

/**
 * The threshold check of every frontal segment of a result (measurement-reference §11), with
 * the film's side naming; null when the result has no frontal segment (a lateral film).
 */
export function implantCentring(
  measurements: Pick<MeasurementResult, 'frontal'>,
  options: ImplantCentringOptions = {},
): ImplantCentringResult | null {
  const thresholdMm = options.thresholdMm ?? DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM
  const entries = Object.entries(measurements.frontal) as [SegmentName, FrontalSegmentMeasurement][]
  if (entries.length === 0) return null
  const segments: ImplantCentringResult['segments'] = {}
  for (const [name, segment] of entries) {
    segments[name] = { offCentre: isImplantOffCentre(segment, thresholdMm) }
  }
  return {
    thresholdMm,
    source: SOURCES.frontalOffset,
    imageRightSide: options.imageRightSide ?? 'unknown',
    segments,
  }
}

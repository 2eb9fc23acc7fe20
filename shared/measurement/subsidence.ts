import type { LandmarkDocument } from '../types/landmarks'
import type {
  DiscHeights,
  SegmentName,
  SubsidenceResult,
  SubsidenceSegmentResult,
} from '../types/measurement'
import { computeMeasurements } from './compute-measurements'
import { SEGMENT_NAMES } from './landmark-names'
import { SOURCES } from './sources'
import { anyFlagged } from './three-valued'

/** Default subsidence threshold: ≥ 2 mm loss of disc height (Rao et al. 2017 [V]). */
export const DEFAULT_SUBSIDENCE_THRESHOLD_MM = 2

/** Slack (mm) so a loss equal to the threshold up to floating-point error is flagged. */
const THRESHOLD_SLACK_MM = 1e-9

export interface SubsidenceOptions {
  /** Flag a loss at or above this many mm; a site setting, default 2 mm. */
  thresholdMm?: number
}

function loss(baseline: number | null, current: number | null): number | null {
  return baseline === null || current === null ? null : baseline - current
}

function atLeast(value: number | null, thresholdMm: number): boolean | null {
  return value === null ? null : value >= thresholdMm - THRESHOLD_SLACK_MM
}

/**
 * Subsidence of one segment from its baseline and current disc heights in mm: loss = baseline −
 * current (positive = lower now) for anterior, posterior, middle and mean height; anterior,
 * posterior and mean are flagged at loss ≥ `thresholdMm` (measurement-reference §7; Rao et al.
 * 2017, J Spine Surg; IJSS interbody-fusion definitions table [V]). `subsided` when any is.
 */
export function subsidenceFromDiscHeightsMm(
  baselineMm: DiscHeights | null,
  currentMm: DiscHeights | null,
  thresholdMm: number = DEFAULT_SUBSIDENCE_THRESHOLD_MM,
): SubsidenceSegmentResult {
  const lossMm: DiscHeights = {
    anterior: loss(baselineMm?.anterior ?? null, currentMm?.anterior ?? null),
    middle: loss(baselineMm?.middle ?? null, currentMm?.middle ?? null),
    posterior: loss(baselineMm?.posterior ?? null, currentMm?.posterior ?? null),
    mean: loss(baselineMm?.mean ?? null, currentMm?.mean ?? null),
  }
  const anteriorFlagged = atLeast(lossMm.anterior, thresholdMm)
  const posteriorFlagged = atLeast(lossMm.posterior, thresholdMm)
  const meanFlagged = atLeast(lossMm.mean, thresholdMm)
  const subsided = anyFlagged([anteriorFlagged, posteriorFlagged, meanFlagged])
  return { lossMm, anteriorFlagged, posteriorFlagged, meanFlagged, subsided }
}

/**
 * Subsidence of every segment of `current` against `baseline`, the first post-op reading of the
 * same segment. A segment is present only when it is measured on both readings; it needs
 * calibration on both films (mm), otherwise its values are null.
 * Both documents are validated (LandmarkDocumentError); a negative or non-finite threshold
 * throws RangeError.
 */
export function computeSubsidence(
  current: LandmarkDocument,
  baseline: LandmarkDocument,
  options: SubsidenceOptions = {},
): SubsidenceResult {
  const thresholdMm = options.thresholdMm ?? DEFAULT_SUBSIDENCE_THRESHOLD_MM
  if (!Number.isFinite(thresholdMm) || thresholdMm < 0) {
    throw new RangeError(`thresholdMm must be a finite number ≥ 0, got ${thresholdMm}`)
  }
  const now = computeMeasurements(current)
  const before = computeMeasurements(baseline)
  const segments: Partial<Record<SegmentName, SubsidenceSegmentResult>> = {}
  for (const segment of SEGMENT_NAMES) {
    const baselineSegment = before.segments[segment]
    const currentSegment = now.segments[segment]
    // A loss needs the segment measured on both films.
    if (baselineSegment === undefined || currentSegment === undefined) continue
    segments[segment] = subsidenceFromDiscHeightsMm(
      baselineSegment.discHeightMm,
      currentSegment.discHeightMm,
      thresholdMm,
    )
  }
  return { thresholdMm, source: SOURCES.subsidence, segments }
}

import type { LandmarkDocument } from '../types/landmarks'
import type {
  InstabilityCriterionResult,
  MotionPairResult,
  MotionSegmentResult,
  SegmentName,
} from '../types/measurement'
import { computeMeasurements } from './compute-measurements'
import { SEGMENT_NAMES } from './landmark-names'
import { SOURCES } from './sources'
import { anyFlagged } from './three-valued'

function exceeds(value: number | null, threshold: number | null): boolean | null {
  if (threshold === null) return false
  return value === null ? null : value > threshold
}

interface CriterionSpec {
  id: InstabilityCriterionResult['id']
  source: string
  translationMm: number | null
  translationPercent: number | null
  angulationDeg: (segment: SegmentName) => number | null
}

/**
 * Published instability criteria; they conflict, so all are reported with their source
 * (measurement-reference §6). White & Panjabi 1990 [M]: > 4.5 mm or > 15 % translation; > 15°
 * at L1-L2 to L3-L4, > 20° at L4-L5, > 25° at L5-S1. Dupuis et al. 1985 [M for the numbers]:
 * > 4 mm, > 10°. The US IDE disc-replacement exclusion: > 5 mm translation [V], the cut-off the
 * plan checks use.
 */
export const INSTABILITY_CRITERIA: readonly CriterionSpec[] = [
  {
    id: 'white-panjabi-1990',
    source: SOURCES.whitePanjabi,
    translationMm: 4.5,
    translationPercent: 15,
    angulationDeg: (segment) => (segment === 'L5-S1' ? 25 : segment === 'L4-L5' ? 20 : 15),
  },
  {
    id: 'dupuis-1985',
    source: SOURCES.dupuis,
    translationMm: 4,
    translationPercent: null,
    angulationDeg: () => 10,
  },
  {
    id: 'ide-translation-5mm',
    source: SOURCES.ideTranslation,
    translationMm: 5,
    translationPercent: null,
    angulationDeg: () => null,
  },
]

/**
 * Applies every criterion to one segment's motion: translation in mm and % of endplate depth,
 * range of motion in degrees. A criterion part whose input is missing (mm on an uncalibrated
 * film) is null rather than false.
 */
export function instabilityCriteria(
  segment: SegmentName,
  translationMm: number | null,
  translationPercent: number | null,
  rangeOfMotionDeg: number | null,
): InstabilityCriterionResult[] {
  return INSTABILITY_CRITERIA.map((spec) => {
    const angulationThresholdDeg = spec.angulationDeg(segment)
    const byMm = exceeds(translationMm, spec.translationMm)
    const byPercent = exceeds(translationPercent, spec.translationPercent)
    const translationFlagged = anyFlagged([byMm, byPercent])
    const angulationFlagged =
      angulationThresholdDeg === null ? null : exceeds(rangeOfMotionDeg, angulationThresholdDeg)
    return {
      id: spec.id,
      source: spec.source,
      translationThresholdMm: spec.translationMm,
      translationThresholdPercent: spec.translationPercent,
      angulationThresholdDeg,
      translationFlagged,
      angulationFlagged,
      flagged: anyFlagged(
        angulationThresholdDeg === null
          ? [translationFlagged]
          : [translationFlagged, angulationFlagged],
      ),
    }
  })
}

/**
 * Motion of every segment between a flexion and an extension film of one visit (measurement-
 * reference §6; Hayes et al. 1989 [V] for normal motion as context). Range of motion =
 * |segmental lordosis(extension) − segmental lordosis(flexion)| in degrees; translation =
 * |d(flexion) − d(extension)| in mm, each film with its own calibration (null if either is
 * uncalibrated); translation % = |slip %(flexion) − slip %(extension)|, i.e. each film
 * normalised by its own endplate depth, so a magnification difference between the films
 * cancels (Hipp et al. 2023 [V]). A segment is present only when it is measured on both films.
 * Both documents are validated (LandmarkDocumentError).
 */
export function computeMotionPair(
  flexion: LandmarkDocument,
  extension: LandmarkDocument,
): MotionPairResult {
  const flexed = computeMeasurements(flexion)
  const extended = computeMeasurements(extension)
  const segments: Partial<Record<SegmentName, MotionSegmentResult>> = {}
  for (const segment of SEGMENT_NAMES) {
    const f = flexed.segments[segment]
    const e = extended.segments[segment]
    // Motion needs the segment on both films.
    if (f === undefined || e === undefined) continue
    const rangeOfMotionDeg =
      f.segmentalLordosisDeg === null || e.segmentalLordosisDeg === null
        ? null
        : Math.abs(e.segmentalLordosisDeg - f.segmentalLordosisDeg)
    const translationMm =
      f.slipMm === null || e.slipMm === null ? null : Math.abs(f.slipMm - e.slipMm)
    const translationPercent =
      f.slipPercent === null || e.slipPercent === null
        ? null
        : Math.abs(f.slipPercent - e.slipPercent)
    segments[segment] = {
      rangeOfMotionDeg,
      translationMm,
      translationPercent,
      criteria: instabilityCriteria(segment, translationMm, translationPercent, rangeOfMotionDeg),
    }
  }
  return { segments }
}

import { angleWrapDeg } from '../geometry/angle'
import type { Point } from '../geometry/types'
import { vectorDot, vectorLength, vectorSubtract, vectorUnit } from '../geometry/vector'
import type { SegmentMeasurement, SegmentName } from '../types/measurement'
import { discHeights } from './disc-height'
import { frameLineAngleDeg, lookUpFrame, type SegmentFrame } from './frame'
import {
  cagePointName,
  cornerName,
  implantMarkerName,
  type LumbarVertebra,
  type Vertebra,
} from './landmark-names'
import {
  isHighGradeSlip,
  meyerdingGradeFromSlipPercent,
  slipDirectionFromSlipPercent,
} from './meyerding'
import type { PreparedPoints } from './prepared-points'
import { slipAngleDeg } from './slip-angle'

interface SegmentSpec {
  readonly name: SegmentName
  readonly upper: LumbarVertebra
  readonly lower: Vertebra
}

interface UpperCorners {
  readonly as: Point
  readonly ps: Point
  readonly pi: Point
  readonly ai: Point
}

function upperCorners(
  points: Readonly<Record<string, Point>>,
  upper: LumbarVertebra,
): UpperCorners | null {
  const as = points[cornerName(upper, 'as')]
  const ps = points[cornerName(upper, 'ps')]
  const pi = points[cornerName(upper, 'pi')]
  const ai = points[cornerName(upper, 'ai')]
  if (as === undefined || ps === undefined || pi === undefined || ai === undefined) return null
  return { as, ps, pi, ai }
}

/**
 * Segmental lordosis in degrees, lordosis positive: θ(U.as − U.ps) − θ(W's lower endplate),
 * where W's lower endplate is W.ai − W.pi, or S1's superior endplate for L5-S1 (Cobb method;
 * index-level definition of the IJSS interbody-fusion table [V]). Null without W.pi / W.ai.
 */
function segmentalLordosisDeg(
  frame: SegmentFrame,
  points: Readonly<Record<string, Point>>,
  upper: UpperCorners,
  lower: Vertebra,
): number | null {
  const posterior = points[cornerName(lower, lower === 'S1' ? 'ps' : 'pi')]
  const anterior = points[cornerName(lower, lower === 'S1' ? 'as' : 'ai')]
  if (posterior === undefined || anterior === undefined) return null
  return angleWrapDeg(
    frameLineAngleDeg(frame, upper.ps, upper.as) - frameLineAngleDeg(frame, posterior, anterior),
  )
}

/**
 * Cage lordosis: θ(cage superior surface) − θ(cage inferior surface), each from its posterior
 * to its anterior point, in the segment frame (measurement-reference §7) [D]. Null without all
 * four cage points.
 */
function cageLordosisDeg(
  frame: SegmentFrame,
  points: Readonly<Record<string, Point>>,
  segment: SegmentName,
): number | null {
  const supP = points[cagePointName(segment, 'sup.p')]
  const supA = points[cagePointName(segment, 'sup.a')]
  const infP = points[cagePointName(segment, 'inf.p')]
  const infA = points[cagePointName(segment, 'inf.a')]
  if (supP === undefined || supA === undefined || infP === undefined || infA === undefined) {
    return null
  }
  return angleWrapDeg(frameLineAngleDeg(frame, supP, supA) - frameLineAngleDeg(frame, infP, infA))
}

/**
 * All measures of one motion segment (measurement-reference §3 and §7), or null when it cannot
 * be computed: it needs U's four corners and W's `as` and `ps` (a degenerate frame is refused
 * earlier, by the parser). Within a computed segment a value whose own landmarks or calibration
 * are missing is null. Angles, percentages and mm values come from `work` space, pixel values
 * from the pixel grid.
 */
export function measureSegment(
  spec: SegmentSpec,
  prepared: PreparedPoints,
): SegmentMeasurement | null {
  const { px, work } = prepared
  const calibrated = prepared.spacing !== null
  const withSlipAngle = spec.name === 'L5-S1' && px['S1.pw'] !== undefined
  const upperWork = upperCorners(work, spec.upper)
  const upperPx = upperCorners(px, spec.upper)
  const lowerPsWork = work[cornerName(spec.lower, 'ps')]
  const lowerAsWork = work[cornerName(spec.lower, 'as')]
  const lowerPsPx = px[cornerName(spec.lower, 'ps')]
  const lowerAsPx = px[cornerName(spec.lower, 'as')]
  const lookup = lookUpFrame(work, spec.upper, spec.lower)
  if (
    upperWork === null ||
    upperPx === null ||
    lowerPsWork === undefined ||
    lowerAsWork === undefined ||
    lowerPsPx === undefined ||
    lowerAsPx === undefined ||
    lookup.kind !== 'frame'
  ) {
    return null
  }
  const frame = lookup.frame
  const depthWork = vectorLength(vectorSubtract(lowerAsWork, lowerPsWork))
  const slipWork = vectorDot(vectorSubtract(upperWork.pi, lowerPsWork), frame.anterior)
  const slipPercent = (100 * slipWork) / depthWork
  // In the pixel grid the endplate direction differs from the mm one when pixels are not
  // square, so the pixel slip is projected on the pixel-space endplate.
  const anteriorPx = vectorUnit(vectorSubtract(lowerAsPx, lowerPsPx))
  const slipPx =
    anteriorPx === null ? null : vectorDot(vectorSubtract(upperPx.pi, lowerPsPx), anteriorPx)

  const marker = work[implantMarkerName(spec.name)]
  const markerAlongWork =
    marker === undefined ? null : vectorDot(vectorSubtract(marker, lowerPsWork), frame.anterior)

  const sacrumPw = work['S1.pw']
  const slipAngle =
    !withSlipAngle || sacrumPw === undefined
      ? null
      : slipAngleDeg(frame, lowerPsWork, sacrumPw, upperWork.pi, upperWork.ai)

  return {
    slipPercent,
    slipMm: calibrated ? slipWork : null,
    slipPx,
    meyerdingGrade: meyerdingGradeFromSlipPercent(slipPercent),
    slipDirection: slipDirectionFromSlipPercent(slipPercent),
    highGrade: isHighGradeSlip(slipPercent),
    segmentalLordosisDeg: segmentalLordosisDeg(frame, work, upperWork, spec.lower),
    discAngleDeg: angleWrapDeg(
      frameLineAngleDeg(frame, upperWork.pi, upperWork.ai) -
        frameLineAngleDeg(frame, lowerPsWork, lowerAsWork),
    ),
    discHeightPx: discHeights(upperPx.pi, upperPx.ai, lowerPsPx, lowerAsPx),
    discHeightMm: calibrated
      ? discHeights(upperWork.pi, upperWork.ai, lowerPsWork, lowerAsWork)
      : null,
    ...(withSlipAngle ? { slipAngleDeg: slipAngle } : {}),
    cageLordosisDeg: cageLordosisDeg(frame, work, spec.name),
    implantPositionPercent: markerAlongWork === null ? null : (100 * markerAlongWork) / depthWork,
    implantOffsetMm:
      markerAlongWork === null || !calibrated ? null : markerAlongWork - depthWork / 2,
  }
}

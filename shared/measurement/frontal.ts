import { angleRadToDeg } from '../geometry/angle'
import { pointCentroid, pointMidpoint } from '../geometry/point'
import type { Point, Vector } from '../geometry/types'
import {
  vectorAdd,
  vectorCross,
  vectorDot,
  vectorLength,
  vectorSubtract,
  vectorUnit,
} from '../geometry/vector'
import type { FrontalSegmentMeasurement, SegmentName } from '../types/measurement'
import {
  frontalImplantName,
  frontalPointName,
  SEGMENTS,
  type LumbarVertebra,
  type Vertebra,
} from './landmark-names'
import type { PreparedPoints } from './prepared-points'

/**
 * How `measureFrontal` reports the two coronal angles. The published measures are unsigned
 * (measurement-reference §11); the uncertainty propagation differentiates the signed angle
 * instead, because |θ| has no derivative at 0 and a perfectly level implant would otherwise
 * get an interval of zero width.
 */
export type FrontalAngleMode = 'unsigned' | 'signed'

/** Keys of `FrontalSegmentMeasurement` that are unsigned angles (folded in the uncertainty). */
export const FRONTAL_UNSIGNED_ANGLE_KEYS: ReadonlySet<string> = new Set([
  'implantTiltDeg',
  'segmentCoronalAngleDeg',
])

interface FrontalPoints {
  readonly upperLeft: Point
  readonly upperRight: Point
  readonly lowerLeft: Point
  readonly lowerRight: Point
  readonly implantLeft: Point | undefined
  readonly implantRight: Point | undefined
  readonly spinous: Point | undefined
}

function frontalPoints(
  points: Readonly<Record<string, Point>>,
  segment: SegmentName,
  upper: LumbarVertebra,
  lower: Vertebra,
): FrontalPoints | null {
  const upperLeft = points[frontalPointName(upper, 'il')]
  const upperRight = points[frontalPointName(upper, 'ir')]
  const lowerLeft = points[frontalPointName(lower, 'sl')]
  const lowerRight = points[frontalPointName(lower, 'sr')]
  if (!upperLeft || !upperRight || !lowerLeft || !lowerRight) return null
  return {
    upperLeft,
    upperRight,
    lowerLeft,
    lowerRight,
    implantLeft: points[frontalImplantName(segment, 'l')],
    implantRight: points[frontalImplantName(segment, 'r')],
    spinous: points[frontalPointName(upper, 'sp')],
  }
}

/**
 * e = unit((U.ir − U.il) + (W.sr − W.sl)): the mean endplate direction, pointing from the `l`
 * to the `r` side (measurement-reference §11) [D]. Null only when the two lines cancel, which
 * the landmark parser refuses beforehand (lines running in opposite directions).
 */
export function frontalEndplateDirection(
  upperLeft: Point,
  upperRight: Point,
  lowerLeft: Point,
  lowerRight: Point,
): Vector | null {
  return vectorUnit(
    vectorAdd(vectorSubtract(upperRight, upperLeft), vectorSubtract(lowerRight, lowerLeft)),
  )
}

/** The angle from `a` to `b` in degrees: signed in (−180°, 180°], or unsigned in [0°, 180°]. */
function angleBetweenDeg(a: Vector, b: Vector, mode: FrontalAngleMode): number {
  const cross = vectorCross(a, b)
  return angleRadToDeg(Math.atan2(mode === 'signed' ? cross : Math.abs(cross), vectorDot(a, b)))
}

/** (q − m)·e: implant centre against the body midline, in the space of the inputs. */
function offsetAlong(points: FrontalPoints, direction: Vector): number | null {
  if (!points.implantLeft || !points.implantRight) return null
  const midline = pointCentroid([
    points.upperLeft,
    points.upperRight,
    points.lowerLeft,
    points.lowerRight,
  ]) as Point
  const centre = pointMidpoint(points.implantLeft, points.implantRight)
  return vectorDot(vectorSubtract(centre, midline), direction)
}

/**
 * Implant centring of one segment U-W on a frontal film (measurement-reference §11) [D], or
 * null when one of U.il, U.ir, W.sl, W.sr is missing. Lengths, ratios and angles come from
 * `work` space (mm when calibrated, so non-square pixels cannot skew them), `lateralOffsetPx`
 * from the pixel grid with the pixel-space direction. Offsets are positive toward the `r` side.
 */
export function measureFrontalSegment(
  segment: SegmentName,
  upper: LumbarVertebra,
  lower: Vertebra,
  prepared: PreparedPoints,
  mode: FrontalAngleMode = 'unsigned',
): FrontalSegmentMeasurement | null {
  const work = frontalPoints(prepared.work, segment, upper, lower)
  const px = frontalPoints(prepared.px, segment, upper, lower)
  if (work === null || px === null) return null
  const direction = frontalEndplateDirection(
    work.upperLeft,
    work.upperRight,
    work.lowerLeft,
    work.lowerRight,
  )
  const directionPx = frontalEndplateDirection(
    px.upperLeft,
    px.upperRight,
    px.lowerLeft,
    px.lowerRight,
  )
  if (direction === null || directionPx === null) return null
  const calibrated = prepared.spacing !== null
  const upperLine = vectorSubtract(work.upperRight, work.upperLeft)
  const lowerLine = vectorSubtract(work.lowerRight, work.lowerLeft)
  const width = (vectorLength(upperLine) + vectorLength(lowerLine)) / 2
  const offset = offsetAlong(work, direction)
  const implantLine =
    work.implantLeft && work.implantRight
      ? vectorSubtract(work.implantRight, work.implantLeft)
      : null
  const spinousOffset = work.spinous
    ? vectorDot(
        vectorSubtract(work.spinous, pointMidpoint(work.upperLeft, work.upperRight)),
        direction,
      )
    : null
  return {
    endplateWidthMm: calibrated ? width : null,
    lateralOffsetMm: calibrated ? offset : null,
    lateralOffsetPx: offsetAlong(px, directionPx),
    lateralOffsetPercent: offset === null ? null : (100 * offset) / width,
    implantTiltDeg: implantLine === null ? null : angleBetweenDeg(direction, implantLine, mode),
    segmentCoronalAngleDeg: angleBetweenDeg(upperLine, lowerLine, mode),
    rotationPercent: spinousOffset === null ? null : (100 * spinousOffset) / (width / 2),
  }
}

/** Every segment measurable on a frontal film, cranial first; `{}` for a lateral document. */
export function measureFrontal(
  prepared: PreparedPoints,
  mode: FrontalAngleMode = 'unsigned',
): Partial<Record<SegmentName, FrontalSegmentMeasurement>> {
  const frontal: Partial<Record<SegmentName, FrontalSegmentMeasurement>> = {}
  for (const spec of SEGMENTS) {
    const measured = measureFrontalSegment(spec.name, spec.upper, spec.lower, prepared, mode)
    if (measured !== null) frontal[spec.name] = measured
  }
  return frontal
}

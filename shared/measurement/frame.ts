import { angleRadToDeg } from '../geometry/angle'
import { pointCentroid, pointMidpoint } from '../geometry/point'
import type { Point, Vector } from '../geometry/types'
import {
  vectorCross,
  vectorDot,
  vectorLength,
  vectorSubtract,
  vectorUnit,
} from '../geometry/vector'
import { cornerName, VERTEBRA_CORNERS, type Vertebra } from './landmark-names'

/**
 * The anatomical frame of a motion segment (measurement-reference §2), built from the labels
 * alone so the film may face either way and be slightly rotated; no facing flag is needed.
 * Both axes are unit vectors in the space of the points they were built from (mm when
 * calibrated, so that non-square pixels do not skew angles).
 */
export interface SegmentFrame {
  /** unit(W.as − W.ps): anterior, along the lower vertebra's superior endplate. */
  readonly anterior: Vector
  /** The unit perpendicular to `anterior` on the side of the upper vertebra: cranial. */
  readonly cranial: Vector
}

/**
 * Relative tolerance below which the upper vertebra's centroid counts as lying on the lower
 * endplate line: |cross(a, v)| ≤ tolerance·|v|. There the cranial side is undefined.
 */
export const FRAME_DEGENERACY_TOLERANCE = 1e-9

/**
 * Builds the frame from the lower endplate corners and the upper vertebra's points; null when
 * the endplate has zero length or the upper centroid lies on the endplate line (within
 * `FRAME_DEGENERACY_TOLERANCE`). Units and space are those of the inputs.
 */
export function segmentFrame(
  upperPoints: readonly Point[],
  lowerPs: Point,
  lowerAs: Point,
): SegmentFrame | null {
  const anterior = vectorUnit(vectorSubtract(lowerAs, lowerPs))
  const upperCentroid = pointCentroid(upperPoints)
  if (anterior === null || upperCentroid === null) return null
  const towardUpper = vectorSubtract(upperCentroid, pointMidpoint(lowerPs, lowerAs))
  const side = vectorCross(anterior, towardUpper)
  if (!(Math.abs(side) > FRAME_DEGENERACY_TOLERANCE * vectorLength(towardUpper))) return null
  // cross(a, v) > 0 means v lies on the (−a.y, a.x) side of a, so that side is cranial.
  const cranial: Vector = side > 0 ? [-anterior[1], anterior[0]] : [anterior[1], -anterior[0]]
  return { anterior, cranial }
}

/**
 * θ(e) = atan2(e·c, e·a) in degrees, (−180°, 180°]: the direction of `direction` in the frame,
 * positive when it rises cranially as it runs anteriorly. Differences of θ are independent of
 * mirroring, rotation and scale [D].
 */
export function frameAngleDeg(frame: SegmentFrame, direction: Vector): number {
  return angleRadToDeg(
    Math.atan2(vectorDot(direction, frame.cranial), vectorDot(direction, frame.anterior)),
  )
}

/** θ of the line from its posterior to its anterior point (the rule for every endplate). */
export function frameLineAngleDeg(frame: SegmentFrame, posterior: Point, anterior: Point): number {
  return frameAngleDeg(frame, vectorSubtract(anterior, posterior))
}

/** Outcome of looking a frame up in a document: built, landmarks missing, or degenerate. */
export type FrameLookup =
  { kind: 'frame'; frame: SegmentFrame } | { kind: 'missing' } | { kind: 'degenerate' }

/**
 * The frame of `upper` over `lower` from a point record: needs `lower.as` and `lower.ps`, and
 * uses the centroid of whichever of the upper vertebra's four corners are present (at least
 * one). Points in any one space; the frame is in that space.
 */
export function lookUpFrame(
  points: Readonly<Record<string, Point>>,
  upper: Vertebra,
  lower: Vertebra,
): FrameLookup {
  const lowerPs = points[cornerName(lower, 'ps')]
  const lowerAs = points[cornerName(lower, 'as')]
  const upperPoints: Point[] = []
  for (const corner of VERTEBRA_CORNERS) {
    const point = points[cornerName(upper, corner)]
    if (point !== undefined) upperPoints.push(point)
  }
  if (lowerPs === undefined || lowerAs === undefined || upperPoints.length === 0) {
    return { kind: 'missing' }
  }
  const frame = segmentFrame(upperPoints, lowerPs, lowerAs)
  return frame === null ? { kind: 'degenerate' } : { kind: 'frame', frame }
}

import { circleFromThreePoints } from '../geometry/circle'
import { pointMidpoint } from '../geometry/point'
import type { Point } from '../geometry/types'
import { rimPointName, type FemoralHead } from './landmark-names'

/**
 * Centre of a femoral head: the point `FH1` / `FH2` itself, or the circumcentre of its three
 * rim points `FHn.rim1..rim3` (measurement-reference §1). Fitted in the space of the points
 * (mm when calibrated, so the fitted circle is a physical circle even for non-square pixels).
 * Null when neither is given, or when the rim is collinear (refused earlier by the parser).
 */
export function femoralHeadCentre(
  points: Readonly<Record<string, Point>>,
  head: FemoralHead,
): Point | null {
  const direct = points[head]
  if (direct !== undefined) return direct
  const a = points[rimPointName(head, 1)]
  const b = points[rimPointName(head, 2)]
  const c = points[rimPointName(head, 3)]
  if (a === undefined || b === undefined || c === undefined) return null
  return circleFromThreePoints(a, b, c)?.center ?? null
}

/**
 * The hip axis H: the midpoint of both femoral head centres (the bicoxofemoral axis), or the one
 * head given (Legaye et al. 1998, Eur Spine J 7:99 [V for PI; M for the wording]). Accepting FH2
 * alone is our choice: a reader who marks only the second head still gets an axis.
 */
export function hipAxis(points: Readonly<Record<string, Point>>): Point | null {
  const first = femoralHeadCentre(points, 'FH1')
  const second = femoralHeadCentre(points, 'FH2')
  if (first !== null && second !== null) return pointMidpoint(first, second)
  return first ?? second
}

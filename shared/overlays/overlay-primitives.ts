import type { Point } from '../geometry/types'
import type { OverlayCategory, OverlayShape } from './overlay-shapes'

/** Midpoint of two image points (px). */
export const midpointPx = (a: Point, b: Point): Point => [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2]
/** a − b (px). */
export const differencePx = (a: Point, b: Point): Point => [a[0] - b[0], a[1] - b[1]]
/** Length of a displacement (px). */
export const lengthPx = (v: Point): number => Math.hypot(v[0], v[1])
/** Direction from `from` to `to`, degrees clockwise from +x (image y is down). */
export const directionDeg = (from: Point, to: Point): number =>
  (Math.atan2(to[1] - from[1], to[0] - from[0]) * 180) / Math.PI

/** A straight overlay line from a to b (image px). */
export function overlayLine(
  id: string,
  category: OverlayCategory,
  a: Point,
  b: Point,
  dashed = false,
): OverlayShape {
  return { kind: 'line', id, category, points: [a[0], a[1], b[0], b[1]], dashed }
}

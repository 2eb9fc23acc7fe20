import type { Point, Vector } from './types'

/**
 * The displacement from `b` to `a` (a − b). Any image-oriented space (x right, y down); the
 * result is in the inputs' unit. Exact up to floating-point rounding; no tolerance.
 */
export function vectorSubtract(a: Point | Vector, b: Point | Vector): Vector {
  return [a[0] - b[0], a[1] - b[1]]
}

/** Component-wise sum a + b, in the inputs' unit and space (x right, y down). No tolerance. */
export function vectorAdd(a: Point | Vector, b: Vector): Vector {
  return [a[0] + b[0], a[1] + b[1]]
}

/** `v` multiplied by the dimensionless factor `factor`; unit and space unchanged. */
export function vectorScale(v: Vector, factor: number): Vector {
  return [v[0] * factor, v[1] * factor]
}

/**
 * Dot product a·b, in the product of the inputs' units (px², mm², or the input unit when one
 * argument is a unit vector). Orientation-free, so the y-down axis does not matter.
 */
export function vectorDot(a: Vector, b: Vector): number {
  return a[0] * b[0] + a[1] * b[1]
}

/**
 * The z component of the 3-D cross product a × b (a.x·b.y − a.y·b.x), in the product of the
 * inputs' units. With y down, a positive value means b lies clockwise of a as seen on screen.
 */
export function vectorCross(a: Vector, b: Vector): number {
  return a[0] * b[1] - a[1] * b[0]
}

/** Euclidean length |v| in the vector's unit. Uses Math.hypot to avoid overflow on large input. */
export function vectorLength(v: Vector): number {
  return Math.hypot(v[0], v[1])
}

/**
 * `v` scaled to length 1 (dimensionless direction, same space), or null when |v| ≤
 * `toleranceLength` (in v's unit; default 0, i.e. only an exactly zero vector is refused).
 */
export function vectorUnit(v: Vector, toleranceLength = 0): Vector | null {
  const length = vectorLength(v)
  if (!(length > toleranceLength)) return null
  return [v[0] / length, v[1] / length]
}

/**
 * `v` turned by a quarter turn: (−dy, dx). With y down this is a clockwise turn on screen. The
 * measurement code always picks the side it needs with a dot product, so callers should not
 * rely on the handedness carrying anatomical meaning. Exact; no tolerance.
 */
export function vectorPerpendicular(v: Vector): Vector {
  return [-v[1], v[0]]
}

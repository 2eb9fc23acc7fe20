import type { Circle, Point } from './types'

/**
 * The circle through three points (circumcircle), in their space and unit (x right, y down).
 * Returns null when the points are collinear or coincident within `collinearTolerance`, a
 * dimensionless ratio: twice the triangle's area divided by the square of its longest side
 * (0 for collinear points, about 0.87 for an equilateral triangle). The default 1e-9 refuses
 * only points that are collinear up to rounding; pass a larger value to refuse near-collinear
 * rims, whose centre is badly conditioned. Used to fit a femoral head centre from rim points.
 */
export function circleFromThreePoints(
  a: Point,
  b: Point,
  c: Point,
  collinearTolerance = 1e-9,
): Circle | null {
  // Work relative to `a` so large image coordinates do not cost precision.
  const bx = b[0] - a[0]
  const by = b[1] - a[1]
  const cx = c[0] - a[0]
  const cy = c[1] - a[1]
  const doubleArea = bx * cy - by * cx
  const longestSquared = Math.max(
    bx * bx + by * by,
    cx * cx + cy * cy,
    (cx - bx) ** 2 + (cy - by) ** 2,
  )
  if (!(longestSquared > 0) || !(Math.abs(doubleArea) > collinearTolerance * longestSquared)) {
    return null
  }
  const bSquared = bx * bx + by * by
  const cSquared = cx * cx + cy * cy
  const denominator = 2 * doubleArea
  const ux = (cy * bSquared - by * cSquared) / denominator
  const uy = (bx * cSquared - cx * bSquared) / denominator
  return { center: [a[0] + ux, a[1] + uy], radius: Math.hypot(ux, uy) }
}

import type { PixelSpacing, Point } from './types'

/** Midpoint of a and b in the inputs' space and unit (x right, y down). No tolerance. */
export function pointMidpoint(a: Point, b: Point): Point {
  return [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2]
}

/**
 * Arithmetic mean of the points (the centroid of the point set, not of the polygon they span),
 * in their space and unit; null for an empty list.
 */
export function pointCentroid(points: readonly Point[]): Point | null {
  if (points.length === 0) return null
  let sumX = 0
  let sumY = 0
  for (const point of points) {
    sumX += point[0]
    sumY += point[1]
  }
  return [sumX / points.length, sumY / points.length]
}

/**
 * Euclidean distance between two image points, in pixels of the pixel grid (x right, y down).
 * For non-square pixels this is not proportional to a physical distance: use `pointDistanceMm`.
 */
export function pointDistancePx(a: Point, b: Point): number {
  return Math.hypot(b[0] - a[0], b[1] - a[1])
}

/**
 * Physical distance in mm between two image points given in pixels, with per-axis spacing:
 * sqrt((Δx·column)² + (Δy·row)²) (measurement-literature §0.3; DICOM PS3.3 §10.7.1.3 [V]).
 */
export function pointDistanceMm(aPx: Point, bPx: Point, spacing: PixelSpacing): number {
  return Math.hypot((bPx[0] - aPx[0]) * spacing.columnMm, (bPx[1] - aPx[1]) * spacing.rowMm)
}

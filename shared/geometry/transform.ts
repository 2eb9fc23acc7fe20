import type { PixelSpacing, Point } from './types'

/**
 * Image pixel coordinates (x right, y down, origin at the top-left pixel centre) to millimetres
 * in the same orientation: x·column spacing, y·row spacing. Angles must be taken after this
 * step, because angles on raw pixels are wrong for non-square pixels [D].
 */
export function pointPxToMm(pointPx: Point, spacing: PixelSpacing): Point {
  return [pointPx[0] * spacing.columnMm, pointPx[1] * spacing.rowMm]
}

/** Inverse of `pointPxToMm`: millimetres (x right, y down) back to image pixels. */
export function pointMmToPx(pointMm: Point, spacing: PixelSpacing): Point {
  return [pointMm[0] / spacing.columnMm, pointMm[1] / spacing.rowMm]
}

/**
 * Normalises the document's `mmPerPixel` (one number for square pixels, or `[row, column]` in
 * DICOM order, PS3.3 §10.7.1.3 [V]) to named row and column spacing in mm. Does not validate:
 * the landmark parser refuses non-positive and non-finite spacing before this is called.
 */
export function spacingFromMmPerPixel(
  mmPerPixel: number | readonly [row: number, column: number],
): PixelSpacing {
  if (typeof mmPerPixel === 'number') return { rowMm: mmPerPixel, columnMm: mmPerPixel }
  return { rowMm: mmPerPixel[0], columnMm: mmPerPixel[1] }
}

import { pointPxToMm, spacingFromMmPerPixel } from '../geometry/transform'
import type { PixelSpacing, Point } from '../geometry/types'
import type { LandmarkDocument } from '../types/landmarks'

/**
 * A validated document's points in the two spaces the engine needs. `px` is the image pixel
 * grid (x right, y down) for pixel-valued lengths; `work` is where angles, ratios and mm values
 * are taken: millimetres when the document is calibrated (so non-square pixels cannot skew an
 * angle, measurement-reference §1), else pixels, assumed square.
 */
export interface PreparedPoints {
  readonly spacing: PixelSpacing | null
  readonly px: Readonly<Record<string, Point>>
  readonly work: Readonly<Record<string, Point>>
}

/** Builds `PreparedPoints` from pixel points and an optional spacing. No validation. */
export function preparePoints(
  pointsPx: Readonly<Record<string, Point>>,
  spacing: PixelSpacing | null,
): PreparedPoints {
  if (spacing === null) return { spacing, px: pointsPx, work: pointsPx }
  const work: Record<string, Point> = {}
  for (const name in pointsPx) {
    const point = pointsPx[name]
    if (point !== undefined) work[name] = pointPxToMm(point, spacing)
  }
  return { spacing, px: pointsPx, work }
}

/**
 * The spacings, in mm per pixel and per axis, that the engine turns into mm values: from 1 nm
 * to 1 km per pixel, far wider than any imaging device (radiographs are about 0.05–1 mm), yet
 * narrow enough that coordinates scaled by it, and their squares and cross products, stay
 * finite and above underflow. A spacing outside it (a damaged header's 1e308, say) would turn
 * every work-space point into Infinity or 0 and lose the angles with the mm values.
 */
export const USABLE_SPACING_MM = { min: 1e-6, max: 1e6 } as const

/** True when both axes of the spacing lie within `USABLE_SPACING_MM` (NaN is not usable). */
function isUsableSpacing(spacing: PixelSpacing): boolean {
  const within = (mm: number) => mm >= USABLE_SPACING_MM.min && mm <= USABLE_SPACING_MM.max
  return within(spacing.rowMm) && within(spacing.columnMm)
}

/**
 * `PreparedPoints` of a document already checked by `parseLandmarkDocument`. A spacing outside
 * `USABLE_SPACING_MM` is treated as none: mm values are null (and `calibration` in the result
 * says so), while angles and percentages, which need no scale, are still measured.
 */
export function prepareDocument(doc: LandmarkDocument): PreparedPoints {
  const spacing =
    doc.mmPerPixel === undefined || doc.mmPerPixel === null
      ? null
      : spacingFromMmPerPixel(doc.mmPerPixel)
  return preparePoints(doc.points, spacing !== null && isUsableSpacing(spacing) ? spacing : null)
}

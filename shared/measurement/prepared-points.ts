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

/** `PreparedPoints` of a document already checked by `parseLandmarkDocument`. */
export function prepareDocument(doc: LandmarkDocument): PreparedPoints {
  const spacing =
    doc.mmPerPixel === undefined || doc.mmPerPixel === null
      ? null
      : spacingFromMmPerPixel(doc.mmPerPixel)
  return preparePoints(doc.points, spacing)
}

import type { OverlayPoints, OverlayShape } from '../overlays/overlay-shapes'

/** A rectangle of whole film pixels: columns x … x + width − 1, rows y … y + height − 1. */
export interface FilmCrop {
  x: number
  y: number
  width: number
  height: number
}

/** Margin round the drawn overlays, as a fraction of their larger side. */
const MARGIN_FRACTION = 0.12
/** The crop is never smaller than this fraction of the film's longer side. */
const MIN_FRACTION = 0.3
/** Width / height kept between these, so a crop of one segment is not a sliver. */
const MIN_ASPECT = 0.75
const MAX_ASPECT = 1.6

/** Every image point an overlay touches (line ends, arc extents, rings, label anchors). */
function overlayExtent(
  shapes: readonly OverlayShape[],
  points: OverlayPoints,
): Array<readonly [number, number]> {
  const at: Array<readonly [number, number]> = [...Object.values(points)]
  for (const shape of shapes) {
    if (shape.kind === 'line') {
      const [x1, y1, x2, y2] = shape.points as [number, number, number, number]
      at.push([x1, y1], [x2, y2])
    } else if (shape.kind === 'arc') {
      const [cx, cy] = shape.center
      at.push(
        [cx - shape.radiusPx, cy - shape.radiusPx],
        [cx + shape.radiusPx, cy + shape.radiusPx],
      )
    } else if (shape.kind === 'ring') at.push(shape.center)
    else at.push(shape.at)
  }
  return at
}

/** Grows [start, start + size) to `wanted` round its middle, kept within [0, limit). */
function grow(start: number, size: number, wanted: number, limit: number): [number, number] {
  const length = Math.min(limit, Math.max(size, wanted))
  const middle = start + size / 2
  const from = Math.min(Math.max(0, middle - length / 2), limit - length)
  return [from, length]
}

/**
 * The part of a film a report shows: the box round every overlay and landmark (image px, x right,
 * y down) with a margin of 12 % of its larger side, at least 30 % of the film's longer side,
 * widened to an aspect between 0.75 and 1.6, kept inside the film and rounded out to whole
 * pixels. The whole film when nothing is drawn. Deterministic, so the PDF and the printed page
 * show the same part.
 */
export function reportFilmCrop(
  shapes: readonly OverlayShape[],
  points: OverlayPoints,
  widthPx: number,
  heightPx: number,
): FilmCrop {
  const extent = overlayExtent(shapes, points)
  if (extent.length === 0) return { x: 0, y: 0, width: widthPx, height: heightPx }
  const xs = extent.map((p) => p[0])
  const ys = extent.map((p) => p[1])
  let left = Math.min(...xs)
  let top = Math.min(...ys)
  let width = Math.max(...xs) - left
  let height = Math.max(...ys) - top
  const margin = MARGIN_FRACTION * Math.max(width, height, 1)
  left -= margin
  top -= margin
  width += 2 * margin
  height += 2 * margin
  const least = MIN_FRACTION * Math.max(widthPx, heightPx)
  ;[left, width] = grow(left, width, Math.max(least, height * MIN_ASPECT), widthPx)
  ;[top, height] = grow(top, height, Math.max(least, width / MAX_ASPECT), heightPx)
  // Pixel edges sit half a pixel from the centres: column i spans [i − 0.5, i + 0.5].
  const x = Math.max(0, Math.floor(left + 0.5))
  const y = Math.max(0, Math.floor(top + 0.5))
  return {
    x,
    y,
    width: Math.min(widthPx - x, Math.ceil(left + width + 0.5) - x),
    height: Math.min(heightPx - y, Math.ceil(top + height + 0.5) - y),
  }
}

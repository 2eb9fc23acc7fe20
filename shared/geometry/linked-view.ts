import type { ViewTransform } from './view-transform'

/** One film's view in its viewport: the transform, its fitted transform, and both sizes. */
export interface LinkedViewSide {
  view: ViewTransform
  /** The transform that fits the whole film in the viewport (viewTransformFit). */
  fit: ViewTransform
  /** Film size, image px [width, height]. */
  imageSizePx: readonly [number, number]
  /** Viewport size, stage CSS px [width, height]. */
  viewportPx: readonly [number, number]
}

/**
 * The view of a target film that follows a source film's view, each relative to its own film
 * and viewport: the target is zoomed by the same factor over its fitted scale, and shows at the
 * middle of its viewport the same point of its film, as a fraction of the film's width and
 * height, that the source shows at the middle of its own. Two films of one size in two equal
 * viewports get the same transform. Scale in stage CSS px per image px; offsets in stage CSS px.
 * A degenerate source (non-positive scale or size) leaves the target at its fit.
 */
export function viewTransformLinked(
  source: LinkedViewSide,
  target: Omit<LinkedViewSide, 'view'>,
): ViewTransform {
  const [sourceWidth, sourceHeight] = source.imageSizePx
  const [targetWidth, targetHeight] = target.imageSizePx
  if (
    !(source.view.scale > 0) ||
    !(source.fit.scale > 0) ||
    !(sourceWidth > 0) ||
    !(sourceHeight > 0)
  )
    return target.fit
  const zoom = source.view.scale / source.fit.scale
  const centreX = (source.viewportPx[0] / 2 - source.view.offsetX) / source.view.scale / sourceWidth
  const centreY =
    (source.viewportPx[1] / 2 - source.view.offsetY) / source.view.scale / sourceHeight
  const scale = target.fit.scale * zoom
  return {
    scale,
    offsetX: target.viewportPx[0] / 2 - centreX * targetWidth * scale,
    offsetY: target.viewportPx[1] / 2 - centreY * targetHeight * scale,
  }
}

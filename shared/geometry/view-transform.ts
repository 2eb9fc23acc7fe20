import type { Point } from './types'

/**
 * How an image is shown in a viewport. Three spaces, all with x to the right and y DOWN:
 * - image: image pixels, origin at the centre of the top-left pixel (the landmark space);
 * - stage: CSS pixels from the top-left corner of the drawing surface (what Konva's
 *   `getPointerPosition` answers);
 * - screen: CSS pixels from the top-left corner of the browser viewport (`clientX/clientY`).
 * Device pixels are stage CSS pixels × devicePixelRatio.
 *
 * stage = image · scale + offset, with `scale` in stage CSS px per image px (> 0) and `offset`
 * in stage CSS px. Rotation and mirroring are not part of the view: the film is shown upright.
 */
export interface ViewTransform {
  readonly scale: number
  readonly offsetX: number
  readonly offsetY: number
}

/** Scale limits in stage CSS px per image px; defaults suit films of 500–5000 px. */
export interface ViewScaleLimits {
  readonly minScale: number
  readonly maxScale: number
}

export const DEFAULT_VIEW_SCALE_LIMITS: ViewScaleLimits = { minScale: 0.02, maxScale: 32 }

/** The transform that shows image pixels 1:1 in stage CSS px, with no offset. */
export const VIEW_TRANSFORM_IDENTITY: ViewTransform = { scale: 1, offsetX: 0, offsetY: 0 }

function isPositiveFinite(value: number): boolean {
  return Number.isFinite(value) && value > 0
}

function clampScale(scale: number, limits: ViewScaleLimits): number {
  return Math.min(limits.maxScale, Math.max(limits.minScale, scale))
}

/**
 * The transform that fits a whole image of `imageWidthPx × imageHeightPx` image px into a
 * viewport of `viewportWidthPx × viewportHeightPx` stage CSS px, centred, leaving at least
 * `marginPx` stage CSS px on every side. Degenerate sizes (zero, negative, not finite, or a
 * margin that leaves no room) give the identity transform rather than NaN or a negative scale.
 */
export function viewTransformFit(
  imageWidthPx: number,
  imageHeightPx: number,
  viewportWidthPx: number,
  viewportHeightPx: number,
  marginPx = 0,
): ViewTransform {
  const roomX = viewportWidthPx - 2 * marginPx
  const roomY = viewportHeightPx - 2 * marginPx
  if (![imageWidthPx, imageHeightPx, roomX, roomY].every(isPositiveFinite)) {
    return VIEW_TRANSFORM_IDENTITY
  }
  const scale = Math.min(roomX / imageWidthPx, roomY / imageHeightPx)
  return {
    scale,
    offsetX: (viewportWidthPx - imageWidthPx * scale) / 2,
    offsetY: (viewportHeightPx - imageHeightPx * scale) / 2,
  }
}

/**
 * The transform that shows one image pixel per DEVICE pixel (true 1:1 on a high-DPI screen:
 * scale = 1 / devicePixelRatio stage CSS px per image px), keeping the image point under
 * `anchorStage` (stage CSS px) where it is. A non-positive or non-finite ratio counts as 1.
 */
export function viewTransformActualSize(
  transform: ViewTransform,
  anchorStage: Point,
  devicePixelRatio: number,
): ViewTransform {
  const ratio = isPositiveFinite(devicePixelRatio) ? devicePixelRatio : 1
  const anchorImage = pointStageToImage(anchorStage, transform)
  const scale = 1 / ratio
  return {
    scale,
    offsetX: anchorStage[0] - anchorImage[0] * scale,
    offsetY: anchorStage[1] - anchorImage[1] * scale,
  }
}

/** Image px → stage CSS px. */
export function pointImageToStage(pointImage: Point, transform: ViewTransform): Point {
  return [
    pointImage[0] * transform.scale + transform.offsetX,
    pointImage[1] * transform.scale + transform.offsetY,
  ]
}

/** Stage CSS px → image px; the inverse of `pointImageToStage` (scale must be > 0). */
export function pointStageToImage(pointStage: Point, transform: ViewTransform): Point {
  return [
    (pointStage[0] - transform.offsetX) / transform.scale,
    (pointStage[1] - transform.offsetY) / transform.scale,
  ]
}

/** Screen CSS px → stage CSS px, given the stage's top-left corner in screen CSS px. */
export function pointScreenToStage(pointScreen: Point, stageOriginScreen: Point): Point {
  return [pointScreen[0] - stageOriginScreen[0], pointScreen[1] - stageOriginScreen[1]]
}

/** Stage CSS px → screen CSS px; the inverse of `pointScreenToStage`. */
export function pointStageToScreen(pointStage: Point, stageOriginScreen: Point): Point {
  return [pointStage[0] + stageOriginScreen[0], pointStage[1] + stageOriginScreen[1]]
}

/** Screen CSS px → image px through the stage. */
export function pointScreenToImage(
  pointScreen: Point,
  stageOriginScreen: Point,
  transform: ViewTransform,
): Point {
  return pointStageToImage(pointScreenToStage(pointScreen, stageOriginScreen), transform)
}

/** Image px → screen CSS px through the stage; the inverse of `pointScreenToImage`. */
export function pointImageToScreen(
  pointImage: Point,
  stageOriginScreen: Point,
  transform: ViewTransform,
): Point {
  return pointStageToScreen(pointImageToStage(pointImage, transform), stageOriginScreen)
}

/** Stage CSS px → device px of the canvas backing store (a ratio ≤ 0 or not finite counts as 1). */
export function pointStageToDevice(pointStage: Point, devicePixelRatio: number): Point {
  const ratio = isPositiveFinite(devicePixelRatio) ? devicePixelRatio : 1
  return [pointStage[0] * ratio, pointStage[1] * ratio]
}

/** A length in image px → stage CSS px (for sizes of handles and labels). */
export function lengthImageToStage(lengthImagePx: number, transform: ViewTransform): number {
  return lengthImagePx * transform.scale
}

/** A length in stage CSS px → image px (a handle that should stay 6 CSS px wide at any zoom). */
export function lengthStageToImage(lengthStagePx: number, transform: ViewTransform): number {
  return lengthStagePx / transform.scale
}

/**
 * Zooms by `factor` (> 1 enlarges) around `anchorStage` (stage CSS px): the image point under
 * the anchor stays under it. The resulting scale is clamped to `limits`; a factor that is not
 * positive and finite leaves the transform unchanged.
 */
export function viewTransformZoomAroundPoint(
  transform: ViewTransform,
  factor: number,
  anchorStage: Point,
  limits: ViewScaleLimits = DEFAULT_VIEW_SCALE_LIMITS,
): ViewTransform {
  if (!isPositiveFinite(factor)) return transform
  const scale = clampScale(transform.scale * factor, limits)
  const anchorImage = pointStageToImage(anchorStage, transform)
  return {
    scale,
    offsetX: anchorStage[0] - anchorImage[0] * scale,
    offsetY: anchorStage[1] - anchorImage[1] * scale,
  }
}

/** Moves the image by (dxStage, dyStage) stage CSS px. */
export function viewTransformPan(
  transform: ViewTransform,
  dxStage: number,
  dyStage: number,
): ViewTransform {
  if (!Number.isFinite(dxStage) || !Number.isFinite(dyStage)) return transform
  return {
    ...transform,
    offsetX: transform.offsetX + dxStage,
    offsetY: transform.offsetY + dyStage,
  }
}

/**
 * A two-finger pinch from touches (firstBefore, secondBefore) to (firstAfter, secondAfter), all
 * in stage CSS px: the image point under the old midpoint follows the new midpoint, and the scale
 * changes by the ratio of the finger distances (clamped to `limits`). Fingers that coincide
 * before the move only pan.
 */
export function viewTransformPinch(
  transform: ViewTransform,
  firstBefore: Point,
  secondBefore: Point,
  firstAfter: Point,
  secondAfter: Point,
  limits: ViewScaleLimits = DEFAULT_VIEW_SCALE_LIMITS,
): ViewTransform {
  const distanceBefore = Math.hypot(
    secondBefore[0] - firstBefore[0],
    secondBefore[1] - firstBefore[1],
  )
  const distanceAfter = Math.hypot(secondAfter[0] - firstAfter[0], secondAfter[1] - firstAfter[1])
  const midBefore: Point = [
    (firstBefore[0] + secondBefore[0]) / 2,
    (firstBefore[1] + secondBefore[1]) / 2,
  ]
  const midAfter: Point = [
    (firstAfter[0] + secondAfter[0]) / 2,
    (firstAfter[1] + secondAfter[1]) / 2,
  ]
  const factor = distanceBefore > 0 && distanceAfter > 0 ? distanceAfter / distanceBefore : 1
  const zoomed = viewTransformZoomAroundPoint(transform, factor, midBefore, limits)
  return viewTransformPan(zoomed, midAfter[0] - midBefore[0], midAfter[1] - midBefore[1])
}

/**
 * Zoom factor of one wheel event: exponential in the scrolled distance so that scrolling in and
 * back out returns to the same scale. `deltaY` in CSS px (positive = away from the user =
 * zoom out); `sensitivity` per CSS px (common practice: about 0.0015).
 */
export function wheelZoomFactor(deltaY: number, sensitivity = 0.0015): number {
  if (!Number.isFinite(deltaY)) return 1
  return Math.exp(-deltaY * sensitivity)
}

/**
 * The part of the image visible in a viewport of `viewportWidthPx × viewportHeightPx` stage CSS
 * px, as image px [left, top, right, bottom] (not clipped to the image).
 */
export function viewTransformVisibleImageRect(
  transform: ViewTransform,
  viewportWidthPx: number,
  viewportHeightPx: number,
): [left: number, top: number, right: number, bottom: number] {
  const [left, top] = pointStageToImage([0, 0], transform)
  const [right, bottom] = pointStageToImage([viewportWidthPx, viewportHeightPx], transform)
  return [left, top, right, bottom]
}

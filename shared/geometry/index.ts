export type { Circle, PixelSpacing, Point, Vector } from './types'
export {
  vectorAdd,
  vectorCross,
  vectorDot,
  vectorLength,
  vectorPerpendicular,
  vectorScale,
  vectorSubtract,
  vectorUnit,
} from './vector'
export {
  angleDegToRad,
  angleDifferenceDeg,
  angleRadToDeg,
  angleWrapDeg,
  vectorAngleDeg,
} from './angle'
export { pointCentroid, pointDistanceMm, pointDistancePx, pointMidpoint } from './point'
export { pointMmToPx, pointPxToMm, spacingFromMmPerPixel } from './transform'
export { circleFromThreePoints } from './circle'
export {
  DEFAULT_VIEW_SCALE_LIMITS,
  lengthImageToStage,
  lengthStageToImage,
  pointImageToScreen,
  pointImageToStage,
  pointScreenToImage,
  pointScreenToStage,
  pointStageToDevice,
  pointStageToImage,
  pointStageToScreen,
  VIEW_TRANSFORM_IDENTITY,
  viewTransformActualSize,
  viewTransformFit,
  viewTransformPan,
  viewTransformPinch,
  viewTransformVisibleImageRect,
  viewTransformZoomAroundPoint,
  wheelZoomFactor,
  type ViewScaleLimits,
  type ViewTransform,
} from './view-transform'

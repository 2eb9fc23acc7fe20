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

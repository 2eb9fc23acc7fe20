import { describe, expect, it } from 'vitest'
// Konva's own affine Transform is the independent reference: the workspace hands the view to a
// Konva stage as x/y/scale, and Konva maps node coordinates to the canvas with this class.
import { Transform } from 'konva/lib/Util.js'
import {
  DEFAULT_VIEW_SCALE_LIMITS,
  lengthImageToStage,
  lengthStageToImage,
  pointImageToScreen,
  pointImageToStage,
  pointScreenToImage,
  pointStageToDevice,
  pointStageToImage,
  VIEW_TRANSFORM_IDENTITY,
  viewTransformActualSize,
  viewTransformFit,
  viewTransformPan,
  viewTransformPinch,
  viewTransformVisibleImageRect,
  viewTransformZoomAroundPoint,
  wheelZoomFactor,
  type ViewTransform,
} from '../../../shared/geometry/view-transform'
import type { Point } from '../../../shared/geometry/types'

/** What a Konva stage with x = offsetX, y = offsetY and scale = scale draws a node point at. */
function konvaStagePoint(transform: ViewTransform, pointImage: Point): Point {
  const t = new Transform()
  t.translate(transform.offsetX, transform.offsetY)
  t.scale(transform.scale, transform.scale)
  const { x, y } = t.point({ x: pointImage[0], y: pointImage[1] })
  return [x, y]
}

/** The larger of the two coordinate differences. */
function gap(actual: Point, expected: Point): number {
  return Math.max(Math.abs(actual[0] - expected[0]), Math.abs(actual[1] - expected[1]))
}

const view: ViewTransform = { scale: 0.37, offsetX: 112.5, offsetY: -48.25 }

describe('viewTransformFit', () => {
  it('fits a tall film by its height and centres it horizontally', () => {
    const t = viewTransformFit(2000, 3000, 1200, 900)
    expect(t.scale).toBeCloseTo(0.3, 12)
    expect(t.offsetX).toBeCloseTo((1200 - 600) / 2, 9)
    expect(t.offsetY).toBeCloseTo(0, 9)
  })

  it('fits a wide film by its width and keeps the margin on every side', () => {
    const t = viewTransformFit(3000, 1000, 1000, 1000, 20)
    expect(t.scale).toBeCloseTo(960 / 3000, 12)
    const [left] = pointImageToStage([0, 0], t)
    const [right] = pointImageToStage([3000, 1000], t)
    expect(left).toBeCloseTo(20, 9)
    expect(right).toBeCloseTo(980, 9)
  })

  it('gives the identity for degenerate sizes instead of NaN or a negative scale', () => {
    expect(viewTransformFit(0, 100, 800, 600)).toEqual(VIEW_TRANSFORM_IDENTITY)
    expect(viewTransformFit(100, 100, 0, 600)).toEqual(VIEW_TRANSFORM_IDENTITY)
    expect(viewTransformFit(100, 100, 30, 30, 20)).toEqual(VIEW_TRANSFORM_IDENTITY)
    expect(viewTransformFit(Number.NaN, 100, 800, 600)).toEqual(VIEW_TRANSFORM_IDENTITY)
  })
})

describe('image ↔ stage ↔ screen', () => {
  it('matches where a Konva stage with the same x, y and scale draws the point', () => {
    for (const p of [
      [0, 0],
      [1234.5, 678.25],
      [-10, 4000],
    ] as Point[]) {
      expect(gap(pointImageToStage(p, view), konvaStagePoint(view, p))).toBeLessThan(1e-9)
    }
  })

  it('round-trips image → stage → image and screen → image → screen', () => {
    const origin: Point = [316, 58]
    for (const p of [
      [0, 0],
      [2999.5, 2499.5],
      [17.125, 903.75],
    ] as Point[]) {
      expect(gap(pointStageToImage(pointImageToStage(p, view), view), p)).toBeLessThan(1e-9)
      expect(
        gap(pointImageToScreen(pointScreenToImage(p, origin, view), origin, view), p),
      ).toBeLessThan(1e-9)
    }
  })

  it('subtracts the stage origin on the way from screen to image', () => {
    const origin: Point = [300, 50]
    expect(gap(pointScreenToImage([300 + 112.5, 50 - 48.25], origin, view), [0, 0])).toBeLessThan(
      1e-9,
    )
  })

  it('keeps y down: a larger image y is lower on the screen', () => {
    const [, top] = pointImageToStage([10, 10], view)
    const [, bottom] = pointImageToStage([10, 20], view)
    expect(bottom).toBeGreaterThan(top)
  })

  it('handles large magnitudes', () => {
    const far: Point = [1e7, -1e7]
    expect(gap(pointStageToImage(pointImageToStage(far, view), view), far)).toBeLessThan(1e-4)
  })

  it('converts lengths both ways', () => {
    expect(lengthImageToStage(100, view)).toBeCloseTo(37, 12)
    expect(lengthStageToImage(lengthImageToStage(42, view), view)).toBeCloseTo(42, 12)
  })
})

describe('device pixel ratio', () => {
  it('multiplies stage CSS px by the ratio, and treats a bad ratio as 1', () => {
    expect(gap(pointStageToDevice([10, 20.5], 2), [20, 41])).toBeLessThan(1e-9)
    expect(gap(pointStageToDevice([10, 20.5], 0), [10, 20.5])).toBeLessThan(1e-9)
    expect(gap(pointStageToDevice([10, 20.5], Number.NaN), [10, 20.5])).toBeLessThan(1e-9)
  })

  it('1:1 shows one image pixel per device pixel and keeps the anchor fixed', () => {
    const anchor: Point = [400, 300]
    const before = pointStageToImage(anchor, view)
    const t = viewTransformActualSize(view, anchor, 2)
    expect(t.scale).toBeCloseTo(0.5, 12)
    // Two neighbouring image pixels land one device pixel apart.
    const a = pointStageToDevice(pointImageToStage([100, 100], t), 2)
    const b = pointStageToDevice(pointImageToStage([101, 100], t), 2)
    expect(b[0] - a[0]).toBeCloseTo(1, 12)
    expect(gap(pointStageToImage(anchor, t), before)).toBeLessThan(1e-9)
  })
})

describe('viewTransformZoomAroundPoint', () => {
  it('keeps the image point under the cursor fixed (Konva zoom-relative-to-pointer recipe)', () => {
    const anchor: Point = [523.5, 201.25]
    const under = pointStageToImage(anchor, view)
    const t = viewTransformZoomAroundPoint(view, 1.8, anchor)
    expect(t.scale).toBeCloseTo(0.37 * 1.8, 12)
    expect(gap(pointImageToStage(under, t), anchor)).toBeLessThan(1e-9)
    // Konva's recipe: newPos = pointer − (pointer − oldPos) / oldScale · newScale.
    expect(t.offsetX).toBeCloseTo(
      anchor[0] - ((anchor[0] - view.offsetX) / view.scale) * t.scale,
      9,
    )
  })

  it('returns to the same view when zooming in and back out', () => {
    const anchor: Point = [10, 700]
    const back = viewTransformZoomAroundPoint(
      viewTransformZoomAroundPoint(view, 3, anchor),
      1 / 3,
      anchor,
    )
    expect(back.scale).toBeCloseTo(view.scale, 12)
    expect(back.offsetX).toBeCloseTo(view.offsetX, 9)
    expect(back.offsetY).toBeCloseTo(view.offsetY, 9)
  })

  it('clamps the scale to the limits and still keeps the anchor fixed', () => {
    const anchor: Point = [50, 50]
    const under = pointStageToImage(anchor, view)
    const t = viewTransformZoomAroundPoint(view, 1e6, anchor)
    expect(t.scale).toBe(DEFAULT_VIEW_SCALE_LIMITS.maxScale)
    expect(gap(pointImageToStage(under, t), anchor)).toBeLessThan(1e-9)
  })

  it('ignores a zero, negative or non-finite factor', () => {
    expect(viewTransformZoomAroundPoint(view, 0, [0, 0])).toEqual(view)
    expect(viewTransformZoomAroundPoint(view, -2, [0, 0])).toEqual(view)
    expect(viewTransformZoomAroundPoint(view, Number.POSITIVE_INFINITY, [0, 0])).toEqual(view)
  })
})

describe('viewTransformPan and viewTransformPinch', () => {
  it('pans by stage pixels and back', () => {
    const t = viewTransformPan(viewTransformPan(view, 30, -12), -30, 12)
    expect(t.offsetX).toBeCloseTo(view.offsetX, 12)
    expect(t.offsetY).toBeCloseTo(view.offsetY, 12)
    expect(viewTransformPan(view, Number.NaN, 0)).toEqual(view)
  })

  it('spreading two fingers to twice the distance doubles the scale around their midpoint', () => {
    const under = pointStageToImage([200, 200], view)
    const t = viewTransformPinch(view, [150, 200], [250, 200], [100, 200], [300, 200])
    expect(t.scale).toBeCloseTo(view.scale * 2, 12)
    expect(gap(pointImageToStage(under, t), [200, 200])).toBeLessThan(1e-9)
  })

  it('a pinch whose fingers move together pans the midpoint only', () => {
    const under = pointStageToImage([200, 200], view)
    const t = viewTransformPinch(view, [150, 200], [250, 200], [170, 230], [270, 230])
    expect(t.scale).toBeCloseTo(view.scale, 12)
    expect(gap(pointImageToStage(under, t), [220, 230])).toBeLessThan(1e-9)
  })

  it('fingers that start on one spot only pan', () => {
    const t = viewTransformPinch(view, [100, 100], [100, 100], [110, 100], [130, 100])
    expect(t.scale).toBe(view.scale)
  })
})

describe('wheelZoomFactor and the visible rectangle', () => {
  it('zooms in for negative deltaY and is symmetric in and out', () => {
    expect(wheelZoomFactor(-100)).toBeGreaterThan(1)
    expect(wheelZoomFactor(100) * wheelZoomFactor(-100)).toBeCloseTo(1, 12)
    expect(wheelZoomFactor(Number.NaN)).toBe(1)
  })

  it('gives the image rectangle under the viewport', () => {
    const t = viewTransformFit(3000, 2500, 1200, 1000)
    const [left, top, right, bottom] = viewTransformVisibleImageRect(t, 1200, 1000)
    expect(top).toBeCloseTo(0, 9)
    expect(bottom).toBeCloseTo(2500, 9)
    expect(right - left).toBeCloseTo(3000, 9)
  })
})

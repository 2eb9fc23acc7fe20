import { describe, expect, it } from 'vitest'
import { circleFromThreePoints } from '../../../shared/geometry/circle'

// Points on the circle centred (3, 4) with radius 5: (8, 4), (3, 9), (−2, 4) by hand.
const onCircle: [number, number][] = [
  [8, 4],
  [3, 9],
  [-2, 4],
]

describe('circleFromThreePoints', () => {
  it('recovers the centre and radius of a circle through three points', () => {
    const circle = circleFromThreePoints(onCircle[0]!, onCircle[1]!, onCircle[2]!)
    expect(circle?.center[0]).toBeCloseTo(3, 12)
    expect(circle?.center[1]).toBeCloseTo(4, 12)
    expect(circle?.radius).toBeCloseTo(5, 12)
  })
  it('refuses collinear points and coincident points', () => {
    expect(circleFromThreePoints([0, 0], [1, 1], [2, 2])).toBeNull()
    expect(circleFromThreePoints([1, 1], [1, 1], [1, 1])).toBeNull()
    expect(circleFromThreePoints([0, 0], [0, 0], [5, 1])).toBeNull()
  })
  it('refuses nearly collinear points only above the tolerance given', () => {
    // Middle point 1e-4 off a 2-unit chord: ratio 2·area/longest² = 2e-4/4 = 5e-5.
    expect(circleFromThreePoints([0, 0], [1, 1e-4], [2, 0], 1e-4)).toBeNull()
    expect(circleFromThreePoints([0, 0], [1, 1e-4], [2, 0], 1e-5)).not.toBeNull()
  })
  it('does not depend on the order (clockwise or counter-clockwise) of the points', () => {
    const forward = circleFromThreePoints(onCircle[0]!, onCircle[1]!, onCircle[2]!)
    const reverse = circleFromThreePoints(onCircle[2]!, onCircle[1]!, onCircle[0]!)
    expect(reverse?.center[0]).toBeCloseTo(forward?.center[0] ?? Number.NaN, 12)
    expect(reverse?.center[1]).toBeCloseTo(forward?.center[1] ?? Number.NaN, 12)
    expect(reverse?.radius).toBeCloseTo(forward?.radius ?? Number.NaN, 12)
  })
  it('gives back a centre from which every input point lies at the radius', () => {
    const points: [number, number][] = [
      [1412.5, 2630.2],
      [1490, 2560],
      [1560.25, 2641],
    ]
    const circle = circleFromThreePoints(points[0]!, points[1]!, points[2]!)
    for (const [x, y] of points) {
      expect(Math.hypot(x - (circle?.center[0] ?? 0), y - (circle?.center[1] ?? 0))).toBeCloseTo(
        circle?.radius ?? 0,
        8,
      )
    }
  })
  it('keeps precision far from the origin', () => {
    const offset = 1e7
    const circle = circleFromThreePoints(
      [offset + 8, offset + 4],
      [offset + 3, offset + 9],
      [offset - 2, offset + 4],
    )
    expect((circle?.center[0] ?? 0) - offset).toBeCloseTo(3, 6)
    expect(circle?.radius).toBeCloseTo(5, 6)
  })
})

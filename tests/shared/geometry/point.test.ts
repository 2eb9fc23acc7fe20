import { describe, expect, it } from 'vitest'
import { norm, subtract } from 'mathjs'
import {
  pointCentroid,
  pointDistanceMm,
  pointDistancePx,
  pointMidpoint,
} from '../../../shared/geometry/point'

describe('pointMidpoint', () => {
  it('returns the point halfway between', () => {
    expect(pointMidpoint([0, 0], [10, 4])).toEqual([5, 2])
  })
  it('of a point with itself is that point', () => {
    expect(pointMidpoint([3, 3], [3, 3])).toEqual([3, 3])
  })
  it('does not depend on argument order', () => {
    expect(pointMidpoint([10, 4], [0, 0])).toEqual(pointMidpoint([0, 0], [10, 4]))
  })
  it('reflected through gives back the other point: 2·mid − a = b', () => {
    const mid = pointMidpoint([1.5, -2], [7, 9])
    expect(2 * mid[0] - 1.5).toBeCloseTo(7, 12)
    expect(2 * mid[1] + 2).toBeCloseTo(9, 12)
  })
  it('keeps precision for large coordinates', () => {
    expect(pointMidpoint([1e12, 1e12], [1e12 + 2, 1e12 + 4])).toEqual([1e12 + 1, 1e12 + 2])
  })
})

describe('pointCentroid', () => {
  it('averages the points', () => {
    expect(
      pointCentroid([
        [0, 0],
        [4, 0],
        [4, 2],
        [0, 2],
      ]),
    ).toEqual([2, 1])
  })
  it('returns null for no points and the point itself for one', () => {
    expect(pointCentroid([])).toBeNull()
    expect(pointCentroid([[7, 8]])).toEqual([7, 8])
  })
  it('does not depend on winding order', () => {
    expect(
      pointCentroid([
        [0, 2],
        [4, 2],
        [4, 0],
        [0, 0],
      ]),
    ).toEqual([2, 1])
  })
  it('moves with a translation of all points and back', () => {
    const moved = pointCentroid([
      [10, 10],
      [14, 10],
      [14, 12],
      [10, 12],
    ]) ?? [0, 0]
    expect([moved[0] - 10, moved[1] - 10]).toEqual([2, 1])
  })
  it('handles large coordinates', () => {
    expect(
      pointCentroid([
        [1e9, 0],
        [1e9 + 2, 0],
      ]),
    ).toEqual([1e9 + 1, 0])
  })
})

describe('pointDistancePx', () => {
  it('returns the Euclidean distance (checked with mathjs)', () => {
    expect(pointDistancePx([1000, 2000], [1300, 2400])).toBeCloseTo(
      Number(norm(subtract([1300, 2400], [1000, 2000]))),
      12,
    )
  })
  it('is zero between a point and itself', () => {
    expect(pointDistancePx([5, 5], [5, 5])).toBe(0)
  })
  it('is symmetric', () => {
    expect(pointDistancePx([1, 2], [4, 6])).toBe(pointDistancePx([4, 6], [1, 2]))
  })
  it('is unchanged by a translation there and back', () => {
    expect(pointDistancePx([101, 102], [104, 106])).toBeCloseTo(5, 12)
  })
  it('is exact for large coordinates', () => {
    expect(pointDistancePx([1e9, 1e9], [1e9 + 3, 1e9 + 4])).toBe(5)
  })
})

describe('pointDistanceMm', () => {
  const square = { rowMm: 0.1, columnMm: 0.1 }
  const anisotropic = { rowMm: 0.1, columnMm: 0.2 }
  it('scales the pixel distance for square pixels', () => {
    expect(pointDistanceMm([0, 0], [30, 40], square)).toBeCloseTo(5, 12)
  })
  it('is zero for one point', () => {
    expect(pointDistanceMm([3, 4], [3, 4], anisotropic)).toBe(0)
  })
  it('uses column spacing along x and row spacing along y', () => {
    // 10 columns × 0.2 mm = 2 mm; 10 rows × 0.1 mm = 1 mm (DICOM PS3.3 §10.7.1.3 order).
    expect(pointDistanceMm([0, 0], [10, 0], anisotropic)).toBeCloseTo(2, 12)
    expect(pointDistanceMm([0, 0], [0, 10], anisotropic)).toBeCloseTo(1, 12)
  })
  it('is symmetric', () => {
    expect(pointDistanceMm([1, 2], [4, 6], anisotropic)).toBe(
      pointDistanceMm([4, 6], [1, 2], anisotropic),
    )
  })
  it('handles large coordinates', () => {
    expect(pointDistanceMm([1e9, 1e9], [1e9 + 30, 1e9 + 40], square)).toBeCloseTo(5, 6)
  })
})

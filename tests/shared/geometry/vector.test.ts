import { describe, expect, it } from 'vitest'
import {
  vectorAdd,
  vectorCross,
  vectorDot,
  vectorLength,
  vectorPerpendicular,
  vectorScale,
  vectorSubtract,
  vectorUnit,
} from '../../../shared/geometry/vector'

// Fixed matrix per function (house style principle 3): typical, degenerate, orientation,
// inverse, large magnitude. Expected values are hand arithmetic.
const LARGE = 1e9

describe('vectorSubtract', () => {
  it('returns the displacement from b to a', () => {
    expect(vectorSubtract([5, 7], [2, 3])).toEqual([3, 4])
  })
  it('returns a zero vector for identical points', () => {
    expect(vectorSubtract([2, 3], [2, 3])).toEqual([0, 0])
  })
  it('changes sign when the arguments swap', () => {
    expect(vectorSubtract([2, 3], [5, 7])).toEqual([-3, -4])
  })
  it('is undone by vectorAdd', () => {
    const [x, y] = vectorAdd(vectorSubtract([5.5, -7.25], [2, 3]), [2, 3])
    expect(x).toBeCloseTo(5.5, 12)
    expect(y).toBeCloseTo(-7.25, 12)
  })
  it('keeps precision on large image coordinates', () => {
    expect(vectorSubtract([LARGE + 3, LARGE + 4], [LARGE, LARGE])).toEqual([3, 4])
  })
})

describe('vectorAdd', () => {
  it('adds component-wise', () => {
    expect(vectorAdd([1, 2], [3, -5])).toEqual([4, -3])
  })
  it('leaves a point unchanged when adding a zero vector', () => {
    expect(vectorAdd([1, 2], [0, 0])).toEqual([1, 2])
  })
  it('does not depend on the order of its arguments', () => {
    expect(vectorAdd([1, 2], [3, 4])).toEqual(vectorAdd([3, 4], [1, 2]))
  })
  it('is undone by subtracting the same vector', () => {
    expect(vectorSubtract(vectorAdd([1, 2], [3, 4]), [3, 4])).toEqual([1, 2])
  })
  it('adds large magnitudes exactly when representable', () => {
    expect(vectorAdd([LARGE, -LARGE], [LARGE, LARGE])).toEqual([2 * LARGE, 0])
  })
})

describe('vectorScale', () => {
  it('multiplies both components by the factor', () => {
    expect(vectorScale([3, -4], 2.5)).toEqual([7.5, -10])
  })
  it('returns a zero vector for factor 0', () => {
    const [x, y] = vectorScale([3, -4], 0)
    expect(Math.abs(x) + Math.abs(y)).toBe(0)
  })
  it('reverses direction for a negative factor', () => {
    expect(vectorScale([3, -4], -1)).toEqual([-3, 4])
  })
  it('is undone by scaling with the reciprocal', () => {
    const [x, y] = vectorScale(vectorScale([3, -4], 7), 1 / 7)
    expect(x).toBeCloseTo(3, 12)
    expect(y).toBeCloseTo(-4, 12)
  })
  it('scales large vectors', () => {
    expect(vectorScale([LARGE, 1], 1000)).toEqual([1e12, 1000])
  })
})

describe('vectorDot', () => {
  it('returns x1·x2 + y1·y2', () => {
    expect(vectorDot([1, 2], [3, 4])).toBe(11)
  })
  it('is zero for perpendicular vectors and for a zero vector', () => {
    expect(vectorDot([1, 2], [-2, 1])).toBe(0)
    expect(vectorDot([0, 0], [3, 4])).toBe(0)
  })
  it('does not depend on argument order and flips sign with one reversed vector', () => {
    expect(vectorDot([3, 4], [1, 2])).toBe(vectorDot([1, 2], [3, 4]))
    expect(vectorDot([-1, -2], [3, 4])).toBe(-11)
  })
  it('of a vector with itself is its squared length', () => {
    expect(Math.sqrt(vectorDot([3, 4], [3, 4]))).toBeCloseTo(vectorLength([3, 4]), 12)
  })
  it('handles large magnitudes', () => {
    expect(vectorDot([LARGE, 0], [LARGE, 5])).toBe(1e18)
  })
})

describe('vectorCross', () => {
  it('returns x1·y2 − y1·x2', () => {
    expect(vectorCross([1, 2], [3, 4])).toBe(-2)
  })
  it('is zero for parallel vectors', () => {
    expect(vectorCross([1, 2], [2, 4])).toBe(0)
  })
  it('changes sign when the arguments swap (clockwise versus counter-clockwise)', () => {
    // With y down, [0, 1] (down) is clockwise of [1, 0] (right) on screen: positive.
    expect(vectorCross([1, 0], [0, 1])).toBe(1)
    expect(vectorCross([0, 1], [1, 0])).toBe(-1)
  })
  it('of a vector with its perpendicular equals its squared length', () => {
    expect(vectorCross([3, 4], vectorPerpendicular([3, 4]))).toBe(25)
  })
  it('handles large magnitudes', () => {
    expect(vectorCross([LARGE, 0], [0, LARGE])).toBe(1e18)
  })
})

describe('vectorLength', () => {
  it('returns the Euclidean length', () => {
    expect(vectorLength([3, 4])).toBe(5)
  })
  it('is zero for a zero vector', () => {
    expect(vectorLength([0, 0])).toBe(0)
  })
  it('does not depend on direction', () => {
    expect(vectorLength([-3, -4])).toBe(vectorLength([4, 3]))
  })
  it('scales linearly and back', () => {
    expect(vectorLength(vectorScale([3, 4], 10)) / 10).toBeCloseTo(5, 12)
  })
  it('does not overflow for very large components', () => {
    expect(vectorLength([3e200, 4e200])).toBeCloseTo(5e200, -190)
  })
})

describe('vectorUnit', () => {
  it('returns a length-1 vector in the same direction', () => {
    const unit = vectorUnit([3, 4])
    expect(unit?.[0]).toBeCloseTo(0.6, 12)
    expect(unit?.[1]).toBeCloseTo(0.8, 12)
  })
  it('returns null for a zero vector and for one within the tolerance', () => {
    expect(vectorUnit([0, 0])).toBeNull()
    expect(vectorUnit([1e-7, 0], 1e-6)).toBeNull()
  })
  it('reverses with a reversed input', () => {
    const unit = vectorUnit([-3, -4])
    expect(unit?.[0]).toBeCloseTo(-0.6, 12)
    expect(unit?.[1]).toBeCloseTo(-0.8, 12)
  })
  it('gives back the input when scaled by its length', () => {
    const unit = vectorUnit([6, -8]) ?? [0, 0]
    const [x, y] = vectorScale(unit, vectorLength([6, -8]))
    expect(x).toBeCloseTo(6, 12)
    expect(y).toBeCloseTo(-8, 12)
  })
  it('normalises large vectors', () => {
    expect(vectorLength(vectorUnit([LARGE, LARGE]) ?? [0, 0])).toBeCloseTo(1, 12)
  })
})

describe('vectorPerpendicular', () => {
  it('returns (−y, x)', () => {
    expect(vectorPerpendicular([3, 4])).toEqual([-4, 3])
  })
  it('maps a zero vector to a zero vector', () => {
    const [x, y] = vectorPerpendicular([0, 0])
    expect(Math.abs(x) + Math.abs(y)).toBe(0)
  })
  it('turns right into down, a clockwise quarter turn on a y-down screen', () => {
    expect(vectorPerpendicular([1, 0])).toEqual([-0, 1])
    expect(vectorDot(vectorPerpendicular([3, 4]), [3, 4])).toBe(0)
  })
  it('returns the input after four turns', () => {
    const turned = [1, 2, 3, 4].reduce<readonly [number, number]>(
      (v) => vectorPerpendicular(v),
      [3, 4],
    )
    expect(turned).toEqual([3, 4])
  })
  it('keeps the length of large vectors', () => {
    expect(vectorLength(vectorPerpendicular([LARGE, 2 * LARGE]))).toBeCloseTo(
      vectorLength([LARGE, 2 * LARGE]),
      0,
    )
  })
})

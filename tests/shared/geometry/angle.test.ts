import { describe, expect, it } from 'vitest'
import { pi } from 'mathjs'
import {
  angleDegToRad,
  angleDifferenceDeg,
  angleRadToDeg,
  angleWrapDeg,
  vectorAngleDeg,
} from '../../../shared/geometry/angle'

describe('angleRadToDeg and angleDegToRad', () => {
  it('convert π/2 to 90° and back', () => {
    expect(angleRadToDeg(pi / 2)).toBeCloseTo(90, 12)
    expect(angleDegToRad(90)).toBeCloseTo(pi / 2, 12)
  })
  it('map zero to zero', () => {
    expect(angleRadToDeg(0)).toBe(0)
    expect(angleDegToRad(0)).toBe(0)
  })
  it('keep the sign of negative angles', () => {
    expect(angleRadToDeg(-pi)).toBeCloseTo(-180, 12)
  })
  it('are inverses of each other', () => {
    expect(angleRadToDeg(angleDegToRad(37.123))).toBeCloseTo(37.123, 12)
  })
  it('convert large angles', () => {
    expect(angleRadToDeg(1e6 * pi)).toBeCloseTo(1.8e8, 4)
  })
})

describe('angleWrapDeg', () => {
  it('leaves angles inside (−180°, 180°] unchanged', () => {
    expect(angleWrapDeg(45)).toBe(45)
    expect(angleWrapDeg(-179.5)).toBe(-179.5)
  })
  it('maps the boundary −180° to +180° and 0° to 0°', () => {
    expect(angleWrapDeg(-180)).toBe(180)
    expect(angleWrapDeg(180)).toBe(180)
    expect(angleWrapDeg(0)).toBe(0)
  })
  it('wraps both directions of a full turn', () => {
    // measurement-literature Example 6: −346.64° wraps to +13.36°.
    expect(angleWrapDeg(-346.64)).toBeCloseTo(13.36, 10)
    expect(angleWrapDeg(346.64)).toBeCloseTo(-13.36, 10)
  })
  it('is undone up to whole turns: wrap(a + 360k) = wrap(a)', () => {
    expect(angleWrapDeg(30 + 3 * 360)).toBeCloseTo(30, 9)
    expect(angleWrapDeg(30 - 5 * 360)).toBeCloseTo(30, 9)
  })
  it('wraps very large angles and returns non-finite input unchanged', () => {
    expect(angleWrapDeg(1e6 + 10)).toBeCloseTo(((1e6 + 10) % 360) - 360, 6)
    expect(angleWrapDeg(Number.NaN)).toBeNaN()
  })
})

describe('angleDifferenceDeg', () => {
  it('subtracts', () => {
    expect(angleDifferenceDeg(30, 10)).toBe(20)
  })
  it('is zero for equal angles', () => {
    expect(angleDifferenceDeg(123, 123)).toBe(0)
  })
  it('is antisymmetric away from 180°', () => {
    expect(angleDifferenceDeg(10, 30)).toBe(-angleDifferenceDeg(30, 10))
  })
  it('takes the short way across ±180°', () => {
    expect(angleDifferenceDeg(-175, 175)).toBeCloseTo(10, 10)
  })
  it('handles large inputs', () => {
    expect(angleDifferenceDeg(720 + 5, -720)).toBeCloseTo(5, 9)
  })
})

describe('vectorAngleDeg', () => {
  it('returns atan2(dy, dx) in degrees', () => {
    expect(vectorAngleDeg([1, 1])).toBeCloseTo(45, 12)
  })
  it('returns 0 for a zero vector (atan2(0, 0))', () => {
    expect(vectorAngleDeg([0, 0])).toBe(0)
  })
  it('is positive towards +y, clockwise on a y-down screen', () => {
    expect(vectorAngleDeg([0, 1])).toBeCloseTo(90, 12)
    expect(vectorAngleDeg([0, -1])).toBeCloseTo(-90, 12)
  })
  it('of the reversed vector differs by 180°', () => {
    expect(angleDifferenceDeg(vectorAngleDeg([-3, -4]), vectorAngleDeg([3, 4]))).toBeCloseTo(
      180,
      10,
    )
  })
  it('does not depend on magnitude', () => {
    expect(vectorAngleDeg([3e9, 4e9])).toBeCloseTo(vectorAngleDeg([3, 4]), 12)
  })
})

import { describe, expect, it } from 'vitest'
import { pointMmToPx, pointPxToMm, spacingFromMmPerPixel } from '../../../shared/geometry/transform'

const anisotropic = { rowMm: 0.1, columnMm: 0.2 }

describe('pointPxToMm and pointMmToPx', () => {
  it('multiply x by column and y by row spacing', () => {
    const [x, y] = pointPxToMm([100, 100], anisotropic)
    expect(x).toBeCloseTo(20, 12)
    expect(y).toBeCloseTo(10, 12)
  })
  it('keep the origin at the origin', () => {
    expect(pointPxToMm([0, 0], anisotropic)).toEqual([0, 0])
  })
  it('keep the orientation: y stays down, x stays right', () => {
    const [x, y] = pointPxToMm([-5, 7], anisotropic)
    expect(x).toBeLessThan(0)
    expect(y).toBeGreaterThan(0)
  })
  it('are inverses', () => {
    const [x, y] = pointMmToPx(pointPxToMm([1234.5, 678.25], anisotropic), anisotropic)
    expect(x).toBeCloseTo(1234.5, 9)
    expect(y).toBeCloseTo(678.25, 9)
  })
  it('handle large coordinates', () => {
    const [x] = pointPxToMm([1e9, 0], anisotropic)
    expect(x).toBeCloseTo(2e8, 3)
  })
})

describe('spacingFromMmPerPixel', () => {
  it('uses one number for both axes', () => {
    expect(spacingFromMmPerPixel(0.139)).toEqual({ rowMm: 0.139, columnMm: 0.139 })
  })
  it('reads a pair as [row, column] (DICOM PS3.3 §10.7.1.3)', () => {
    expect(spacingFromMmPerPixel([0.1, 0.2])).toEqual({ rowMm: 0.1, columnMm: 0.2 })
  })
})

/**
 * A spacing no device produces (a damaged header's 1e308, or 1e-308) must cost the mm values
 * only: angles and percentages are ratios of lengths, independent of the scale, so they are
 * the same as on the uncalibrated document (Taillard slip and Cobb angles are scale-free by
 * definition, Butt & Saifuddin 2005; Cobb 1948).
 */
import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { computeUncertainty } from '../../../shared/measurement/uncertainty'
import { USABLE_SPACING_MM } from '../../../shared/measurement/prepared-points'
import type { LandmarkDocument } from '../../../shared/types/landmarks'

// measurement literature, Example 1 (constructed coordinates): a 10 % slip at L5-S1 over a
// 300 px S1 endplate, with L4 corners invented above L5 so two segments are measured.
const points: LandmarkDocument['points'] = {
  'L4.as': [1320, 1420],
  'L4.ps': [1020, 1400],
  'L4.pi': [1020, 1640],
  'L4.ai': [1320, 1660],
  'L5.as': [1330, 1790],
  'L5.ps': [1030, 1760],
  'L5.pi': [1030, 1940],
  'L5.ai': [1330, 1960],
  'S1.ps': [1000, 2000],
  'S1.as': [1300, 2000],
}

const uncalibrated = computeMeasurements({ mmPerPixel: null, points })

describe('a spacing outside what any image can have', () => {
  it.each([
    ['1e308 (overflows once multiplied by a coordinate)', 1e308],
    ['1e300', 1e300],
    ['1e-308 (underflows in a cross product)', 1e-308],
    ['[0.1, 1e308]', [0.1, 1e308] as [number, number]],
    ['[1e-320, 0.1]', [1e-320, 0.1] as [number, number]],
  ])('%s keeps every angle and percentage and nulls only the mm values', (_label, mmPerPixel) => {
    const result = computeMeasurements({ mmPerPixel, points })
    expect(Object.keys(result.segments).sort()).toEqual(['L4-L5', 'L5-S1'])
    const segment = result.segments['L5-S1']!
    const reference = uncalibrated.segments['L5-S1']!
    // 100 · 30 / 300 = 10 % (Example 1 by hand).
    expect(segment.slipPercent).toBeCloseTo(10, 9)
    expect(segment.segmentalLordosisDeg).toBeCloseTo(reference.segmentalLordosisDeg!, 9)
    expect(segment.discAngleDeg).toBeCloseTo(reference.discAngleDeg!, 9)
    expect(result.lumbarLordosisDeg).toBe(uncalibrated.lumbarLordosisDeg)
    expect(segment.slipMm).toBeNull()
    expect(segment.discHeightMm).toBeNull()
    expect(result.calibration).toBeNull()
  })

  it('still reports mm for any spacing inside the usable range, at both of its ends', () => {
    for (const spacing of [USABLE_SPACING_MM.min, 0.14, USABLE_SPACING_MM.max]) {
      const result = computeMeasurements({ mmPerPixel: spacing, points })
      // slip d = 30 px (Example 1), so 30 × spacing mm.
      expect(result.segments['L5-S1']!.slipMm! / (30 * spacing)).toBeCloseTo(1, 9)
    }
  })

  it('gives finite intervals for the angles, and none in mm', () => {
    const result = computeUncertainty({ mmPerPixel: 1e308, points })
    const segment = result.measurements.segments['L5-S1']!
    expect(segment.slipPercent?.value).toBeCloseTo(10, 9)
    expect(Number.isFinite(segment.slipPercent?.standardDeviation)).toBe(true)
    expect(segment.slipMm).toBeNull()
    expect(result.sigma.unit).toBe('px')
  })
})

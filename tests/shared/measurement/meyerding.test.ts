/**
 * Meyerding grading (Meyerding 1932, Surg Gynecol Obstet 54:371 [M]; endplate quarters via
 * Butt & Saifuddin 2005 [V]): slip rounded to 0.1 % half up, upper-inclusive boundaries
 * (the 0–25 / 26–50 ranges [V-sec]), high-grade > 50 % (Kasliwal et al. [V]).
 */
import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import {
  isHighGradeSlip,
  meyerdingGradeFromSlipPercent,
  roundSlipPercent,
} from '../../../shared/measurement/meyerding'
import type { Xy } from '../support/reference-math'

// L5-S1 with a 200 px S1 endplate on y = 2000, so d px of slip is d/2 %.
function slipDocument(dPx: number) {
  const q: Xy = [1000 + dPx, 1950]
  return {
    points: {
      'S1.ps': [1000, 2000] as Xy,
      'S1.as': [1200, 2000] as Xy,
      'L5.pi': q,
      'L5.ai': [q[0] + 200, 1950] as Xy,
      'L5.ps': [q[0], 1800] as Xy,
      'L5.as': [q[0] + 200, 1800] as Xy,
    },
  }
}

describe('Meyerding grade boundaries', () => {
  it.each([
    [50, 25, 'I'],
    [100, 50, 'II'],
    [150, 75, 'III'],
    [200, 100, 'IV'],
  ])('grades a slip of exactly %d px = %d %% as %s (upper-inclusive)', (dPx, percent, grade) => {
    const segment = computeMeasurements(slipDocument(dPx)).segments['L5-S1']!
    expect(segment.slipPercent).toBeCloseTo(percent, 10)
    expect(segment.meyerdingGrade).toBe(grade)
  })
  it.each([
    [50.2, 'II'],
    [100.2, 'III'],
    [150.2, 'IV'],
    [200.2, 'V'],
  ])('grades 0.1 %% above a boundary (%d px) as %s', (dPx, grade) => {
    expect(computeMeasurements(slipDocument(dPx)).segments['L5-S1']!.meyerdingGrade).toBe(grade)
  })
  it('gives no grade at 0 % or for a retrolisthesis', () => {
    expect(computeMeasurements(slipDocument(0)).segments['L5-S1']!.meyerdingGrade).toBeNull()
    expect(computeMeasurements(slipDocument(-30)).segments['L5-S1']!.meyerdingGrade).toBeNull()
  })
})

describe('rounding to 0.1 % half up before grading', () => {
  it('rounds 25.04 % down to 25.0 (I) and 25.05 % up to 25.1 (II)', () => {
    expect(roundSlipPercent(25.04)).toBeCloseTo(25.0, 12)
    expect(roundSlipPercent(25.05)).toBeCloseTo(25.1, 12)
    expect(meyerdingGradeFromSlipPercent(25.04)).toBe('I')
    expect(meyerdingGradeFromSlipPercent(25.05)).toBe('II')
  })
  it('does not let floating-point error flip a grade: 25.000000001 % is I', () => {
    expect(meyerdingGradeFromSlipPercent(25.000000001)).toBe('I')
    expect(meyerdingGradeFromSlipPercent(0.1 * 250)).toBe('I')
  })
  it('rounds a decimal half that binary cannot hold as written (100·0.2505 = 25.05)', () => {
    expect(meyerdingGradeFromSlipPercent(100 * 0.2505)).toBe('II')
  })
  it('treats a slip that rounds to 0.0 % as no slip and 0.05 % as grade I', () => {
    expect(meyerdingGradeFromSlipPercent(0.049)).toBeNull()
    expect(meyerdingGradeFromSlipPercent(0.05)).toBe('I')
    expect(meyerdingGradeFromSlipPercent(-0.04)).toBeNull()
  })
  it('rounds negative halves towards +∞ (half up): −2.25 → −2.2', () => {
    expect(roundSlipPercent(-2.25)).toBeCloseTo(-2.2, 12)
  })
})

describe('high-grade slip', () => {
  it('is false at exactly 50.0 % and true at 50.1 % (Kasliwal et al. "> 50 %")', () => {
    expect(isHighGradeSlip(50)).toBe(false)
    expect(isHighGradeSlip(50.04)).toBe(false)
    expect(isHighGradeSlip(50.05)).toBe(true)
    expect(computeMeasurements(slipDocument(100)).segments['L5-S1']!.highGrade).toBe(false)
    expect(computeMeasurements(slipDocument(100.2)).segments['L5-S1']!.highGrade).toBe(true)
  })
})

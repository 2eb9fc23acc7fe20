import { describe, expect, it } from 'vitest'
import { erf } from 'mathjs'
import { erfc, normalCdf } from '../../../shared/measurement/normal-distribution'

describe('erfc', () => {
  it('agrees with 1 − erf from mathjs within 2e-7 over −5…5 (Numerical Recipes erfcc bound 1.2e-7 [M])', () => {
    for (let x = -5; x <= 5; x += 0.25) {
      expect(Math.abs(erfc(x) - (1 - erf(x)))).toBeLessThan(2e-7)
    }
  })
  it('is 1 at 0 and tends to 0 and 2 in the tails', () => {
    expect(erfc(0)).toBeCloseTo(1, 6)
    expect(erfc(10)).toBeLessThan(1e-40)
    expect(erfc(-10)).toBeCloseTo(2, 12)
  })
})

describe('normalCdf', () => {
  it('gives 0.975 at mean + 1.96 SD', () => {
    expect(normalCdf(10 + 1.959963984540054 * 2, 10, 2)).toBeCloseTo(0.975, 6)
  })
  it('treats SD 0 as a point mass', () => {
    expect(normalCdf(1, 1, 0)).toBe(1)
    expect(normalCdf(0.999, 1, 0)).toBe(0)
  })
})

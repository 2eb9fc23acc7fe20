import { describe, expect, it } from 'vitest'
import {
  blandAltman,
  StatisticsInputError,
  type BlandAltmanResult,
} from '../../../shared/statistics/index'
import { tQuantile } from '../../../shared/statistics/distributions'

/**
 * Peak expiratory flow rate (l/min) of 17 people, first reading with the large Wright meter and
 * first with the mini Wright meter: Bland & Altman (1986, Lancet i:307), Table 1, as transcribed
 * in the R package qwraps2 (data set `pefr`).
 */
const WRIGHT = [494, 395, 516, 434, 476, 557, 413, 442, 650, 433, 417, 656, 267, 478, 178, 423, 427]
const MINI = [512, 430, 520, 428, 500, 600, 364, 380, 658, 445, 432, 626, 260, 477, 259, 350, 451]
const PEFR = WRIGHT.map((wright, i) => [wright, MINI[i] as number])

function ok(result: ReturnType<typeof blandAltman>): BlandAltmanResult {
  if (result.status !== 'ok') throw new Error(`expected numbers, got: ${result.reason}`)
  return result
}

describe('blandAltman on the PEFR data of Bland & Altman (1986)', () => {
  // The 1986 paper takes the limits as mean ± 2 SD.
  const result = ok(blandAltman(PEFR, { sdMultiplier: 2 }))

  it('gives the published bias and SD of the differences (large meter minus mini meter)', () => {
    // Bland & Altman 1986: mean difference −2.1 l/min, SD 38.8 l/min.
    expect(result.bias).toBeCloseTo(-2.1, 1)
    expect(result.sd).toBeCloseTo(38.8, 1)
    expect(result.n).toBe(17)
  })

  it('gives the published limits of agreement', () => {
    // Bland & Altman 1986: −79.7 to 75.5 l/min, computed there from the rounded −2.1 and 38.8;
    // the unrounded limits are −79.65 and 75.41.
    expect(Math.abs(result.lower - -79.7)).toBeLessThan(0.1)
    expect(Math.abs(result.upper - 75.5)).toBeLessThan(0.1)
  })

  it('gives the confidence interval of the bias', () => {
    // From memory, verify: Bland & Altman 1986 give SE(bias) = 9.4, t(16) = 2.12 and a 95 % CI
    // of −22.0 to 17.8 l/min.
    expect(result.biasInterval.lower).toBeCloseTo(-22.0, 1)
    expect(result.biasInterval.upper).toBeCloseTo(17.8, 1)
  })

  it('widens the 1986 interval of each limit by the Bland & Altman (1999) variance', () => {
    // From memory, verify: the 1986 paper takes SE(limit) ≈ √(3s²/n) = 16.3 l/min, so −114.3
    // to −45.1 and 40.9 to 110.1. The 1999 variance (1/n + z²/(2(n − 1)))·s² with z = 2 is
    // larger by the factor √((1/17 + 4/32) / (3/17)) = 1.021 here.
    const t = tQuantile(0.975, 16)
    const halfWidth = (result.lowerInterval.upper - result.lowerInterval.lower) / 2
    expect(halfWidth).toBeCloseTo(t * result.sd * Math.sqrt(1 / 17 + 4 / 32), 10)
    expect(halfWidth / (2.12 * 16.3)).toBeGreaterThan(1.0)
    expect(halfWidth / (2.12 * 16.3)).toBeLessThan(1.03)
    expect(result.lowerInterval.lower).toBeCloseTo(-114.3, -1)
    expect(result.upperInterval.upper).toBeCloseTo(110.1, -1)
  })

  it('uses 1.96 SD by default (Bland & Altman 1999)', () => {
    const standard = ok(blandAltman(PEFR))
    expect(standard.sdMultiplier).toBe(1.96)
    expect(standard.upper - standard.lower).toBeCloseTo(2 * 1.96 * standard.sd, 10)
  })
})

describe('blandAltman data handling', () => {
  it('leaves out pairs with a missing value and counts them', () => {
    const result = ok(blandAltman([...PEFR, [300, null], [null, 250]], { sdMultiplier: 2 }))
    expect(result.n).toBe(17)
    expect(result.excluded).toBe(2)
    expect(result.bias).toBeCloseTo(-36 / 17, 12)
  })

  it('answers "not enough data" below two complete pairs', () => {
    expect(
      blandAltman([
        [1, 2],
        [3, null],
      ]),
    ).toMatchObject({ status: 'not-enough-data', n: 1 })
  })

  it('refuses more than two raters', () => {
    expect(() =>
      blandAltman([
        [1, 2, 3],
        [4, 5, 6],
      ]),
    ).toThrow(StatisticsInputError)
  })
})

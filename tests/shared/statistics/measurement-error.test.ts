import { describe, expect, it } from 'vitest'
import {
  intraclassCorrelations,
  kooLiBand,
  kooLiInterpretation,
  measurementError,
} from '../../../shared/statistics/index'

describe('SEM and MDC95 (Weir 2005)', () => {
  it('takes SEM = √MSE and MDC95 = 1.96·√2·SEM', () => {
    // Hand arithmetic on the Shrout & Fleiss (1979) example: EMS = 1.019444, √ = 1.009675.
    const result = intraclassCorrelations([
      [9, 2, 5, 8],
      [6, 1, 3, 2],
      [8, 4, 6, 8],
      [7, 1, 2, 6],
      [10, 5, 6, 9],
      [6, 2, 4, 7],
    ])
    if (result.status !== 'ok') throw new Error(result.reason)
    const { sem, mdc95 } = measurementError(result.meanSquares)
    expect(sem).toBeCloseTo(Math.sqrt(36.7 / 36), 10)
    expect(mdc95).toBeCloseTo(1.96 * Math.SQRT2 * Math.sqrt(36.7 / 36), 10)
  })
})

describe('Koo & Li (2016) bands', () => {
  it.each([
    [0.49, 'poor'],
    [0.5, 'moderate'],
    [0.74, 'moderate'],
    [0.75, 'good'],
    [0.9, 'good'],
    [0.91, 'excellent'],
    [-0.2, 'poor'],
  ] as const)('reads %f as %s (cut points 0.5, 0.75, 0.9)', (icc, band) => {
    expect(kooLiBand(icc)).toBe(band)
  })

  it('reads an interval spanning bands as a range, as Koo & Li advise', () => {
    // From memory, verify: Koo & Li 2016 read a 95 % CI of 0.83–0.94 as "good" to "excellent".
    expect(kooLiInterpretation({ icc: 0.9, lower: 0.83, upper: 0.94 }).summary).toBe(
      'good to excellent',
    )
    expect(kooLiInterpretation({ icc: 0.8, lower: 0.77, upper: 0.85 }).summary).toBe('good')
  })

  it('puts a value that is not defined in no band (never "excellent" by default)', () => {
    expect(kooLiBand(Number.NaN)).toBeNull()
    expect(kooLiInterpretation({ icc: -0.29, lower: Number.NaN, upper: Number.NaN }).summary).toBe(
      'not defined',
    )
  })
})

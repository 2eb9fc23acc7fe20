import { describe, expect, it } from 'vitest'
import {
  ICC_FORMS,
  intraclassCorrelations,
  StatisticsInputError,
  type IccAnalysis,
} from '../../../shared/statistics/index'
import golden from '../../fixtures/statistics/psych-golden.json'

/** Shrout & Fleiss (1979): four judges rating six targets. */
const SHROUT_FLEISS = [
  [9, 2, 5, 8],
  [6, 1, 3, 2],
  [8, 4, 6, 8],
  [7, 1, 2, 6],
  [10, 5, 6, 9],
  [6, 2, 4, 7],
]

function ok(result: ReturnType<typeof intraclassCorrelations>): IccAnalysis {
  if (result.status !== 'ok') throw new Error(`expected numbers, got: ${result.reason}`)
  return result
}

describe('intraclassCorrelations against Shrout & Fleiss (1979)', () => {
  const result = ok(intraclassCorrelations(SHROUT_FLEISS))

  it('reproduces the six published estimates to their two decimals (Table 2)', () => {
    // Shrout & Fleiss 1979, Table 2: .17, .29, .71 (single judge), .44, .62, .91 (mean of 4).
    const published = {
      '1,1': 0.17,
      '2,1': 0.29,
      '3,1': 0.71,
      '1,k': 0.44,
      '2,k': 0.62,
      '3,k': 0.91,
    }
    for (const form of ICC_FORMS) {
      expect(Math.round(result.forms[form].icc * 100) / 100).toBe(published[form])
    }
  })

  it('reproduces the mean squares of their analysis of variance', () => {
    // Shrout & Fleiss 1979: BMS 11.24, WMS 6.26, JMS 32.49, EMS 1.02.
    expect(result.meanSquares.betweenTargets).toBeCloseTo(11.24, 2)
    expect(result.meanSquares.withinTargets).toBeCloseTo(6.26, 2)
    expect(result.meanSquares.betweenRaters).toBeCloseTo(32.49, 2)
    expect(result.meanSquares.residual).toBeCloseTo(1.02, 2)
    expect(result.n).toBe(6)
    expect(result.k).toBe(4)
    expect(result.excluded).toBe(0)
  })

  it('tests the one-way forms on (n − 1, n(k − 1)) and the two-way forms on (n − 1, (n − 1)(k − 1)) df', () => {
    // Shrout & Fleiss 1979: F = BMS/WMS for model 1, BMS/EMS for models 2 and 3.
    expect(result.forms['1,1']).toMatchObject({ df1: 5, df2: 18 })
    expect(result.forms['1,1'].f).toBeCloseTo(11.2416667 / 6.2638889, 6)
    for (const form of ['2,1', '3,1', '2,k', '3,k'] as const) {
      expect(result.forms[form]).toMatchObject({ df1: 5, df2: 15 })
      expect(result.forms[form].f).toBeCloseTo(11.2416667 / 1.0194444, 5)
    }
  })
})

describe('intraclassCorrelations against R psych::ICC (golden fixtures)', () => {
  // psych 2.2.9 on R 4.2.2, psych::ICC(na.omit(ratings), lmer = FALSE); see the fixture's
  // generatedBy block and psych-golden.R for the exact command.
  it('names the implementation that produced the fixture', () => {
    expect(golden.generatedBy.psych).toBe('2.2.9')
    expect(golden.generatedBy.R).toMatch(/^R version 4\.2\.2/)
  })

  for (const testCase of golden.icc) {
    it(`matches every form, F test and 95 % interval for ${testCase.name} (${testCase.note})`, () => {
      const result = ok(intraclassCorrelations(testCase.ratings))
      expect(result.n).toBe(testCase.n)
      expect(result.k).toBe(testCase.k)
      expect(result.excluded).toBe(testCase.excluded)
      expect(result.meanSquares.betweenTargets).toBeCloseTo(testCase.meanSquares.betweenTargets, 9)
      expect(result.meanSquares.withinTargets).toBeCloseTo(testCase.meanSquares.withinTargets, 9)
      expect(result.meanSquares.betweenRaters).toBeCloseTo(testCase.meanSquares.betweenRaters, 9)
      expect(result.meanSquares.residual).toBeCloseTo(testCase.meanSquares.residual, 9)
      for (const form of ICC_FORMS) {
        const expected = testCase.forms[form]
        const actual = result.forms[form]
        expect(actual.df1).toBe(expected.df1)
        expect(actual.df2).toBe(expected.df2)
        for (const key of ['icc', 'f', 'lower', 'upper'] as const) {
          expect(actual[key]).toBeCloseTo(expected[key], 10)
        }
        // p-values span many orders of magnitude: compare relatively.
        expect(Math.abs(actual.p - expected.p) / expected.p).toBeLessThan(1e-9)
      }
    })
  }
})

describe('missing ratings and too little data', () => {
  it('leaves out every target with a missing rating and counts it', () => {
    const withGaps = [...SHROUT_FLEISS, [5, null, 4, 6], [null, null, 1, 2]]
    const result = ok(intraclassCorrelations(withGaps))
    expect(result.excluded).toBe(2)
    expect(result.n).toBe(6)
    expect(result.forms['2,1'].icc).toBeCloseTo(
      ok(intraclassCorrelations(SHROUT_FLEISS)).forms['2,1'].icc,
      12,
    )
  })

  it('answers "not enough data" with fewer than 2 complete targets', () => {
    const result = intraclassCorrelations([
      [1, 2, 3],
      [4, null, 6],
    ])
    expect(result).toMatchObject({
      status: 'not-enough-data',
      n: 1,
      k: 3,
      excluded: 1,
      reason: expect.stringMatching(/at least 2/),
    })
  })

  it('answers "not enough data" when every rating is the same', () => {
    const result = intraclassCorrelations([
      [12.5, 12.5],
      [12.5, 12.5],
      [12.5, 12.5],
    ])
    expect(result).toMatchObject({
      status: 'not-enough-data',
      reason: expect.stringMatching(/no variance/),
    })
  })

  it('answers "not enough data" when the targets do not differ', () => {
    // Row means are all 5: only raters and error vary, so no reliability ratio exists.
    const result = intraclassCorrelations([
      [4, 6],
      [6, 4],
      [5, 5],
    ])
    expect(result).toMatchObject({
      status: 'not-enough-data',
      reason: expect.stringMatching(/targets do not differ/),
    })
  })

  it('gives 1 with a degenerate interval for perfect agreement (infinite F)', () => {
    const result = ok(
      intraclassCorrelations([
        [10, 10],
        [20, 20],
        [35, 35],
      ]),
    )
    for (const form of ICC_FORMS) {
      expect(result.forms[form]).toMatchObject({ icc: 1, lower: 1, upper: 1, f: Infinity, p: 0 })
    }
  })
})

describe('refused input', () => {
  it.each([
    ['an empty table', []],
    ['a row that is not an array', [[1, 2], 3]],
    ['ragged rows', [[1, 2], [3]]],
    [
      'a text value',
      [
        [1, 2],
        [3, '4'],
      ],
    ],
    [
      'a non-finite value',
      [
        [1, 2],
        [3, Infinity],
      ],
    ],
    ['a single rater', [[1], [2], [3]]],
  ])('throws StatisticsInputError for %s', (_label, table) => {
    expect(() => intraclassCorrelations(table as never)).toThrow(StatisticsInputError)
  })
})

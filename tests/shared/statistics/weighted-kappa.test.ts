import { describe, expect, it } from 'vitest'
import {
  kappaWeights,
  StatisticsInputError,
  weightedKappa,
  weightedKappaFromTable,
  type KappaResult,
} from '../../../shared/statistics/index'
import psych from '../../fixtures/statistics/psych-golden.json'
import statsmodels from '../../fixtures/statistics/statsmodels-kappa.json'

function ok(result: ReturnType<typeof weightedKappaFromTable>): KappaResult {
  if (result.status !== 'ok') throw new Error(`expected numbers, got: ${result.reason}`)
  return result
}

/**
 * Cohen (1968, Psychol Bull 70:213): two diagnosticians' proportions over three categories for
 * 200 patients, with disagreement weights v (0 on the diagonal), as quoted in the examples of R
 * psych's cohen.kappa. As counts: proportions × 200.
 */
const COHEN_COUNTS = [
  [88, 14, 18],
  [10, 40, 10],
  [2, 6, 12],
]
const COHEN_DISAGREEMENT = [
  [0, 1, 3],
  [1, 0, 6],
  [3, 6, 0],
]
/** Agreement weights 1 − v / max(v) give the same kappa as Cohen's disagreement form. */
const COHEN_AGREEMENT = COHEN_DISAGREEMENT.map((row) => row.map((v) => 1 - v / 6))

const caseNamed = (name: string) => {
  const fromPsych = psych.kappa.find((c) => c.name === name)
  const fromStatsmodels = statsmodels.kappa.find((c) => c.name === name)
  if (!fromPsych || !fromStatsmodels) throw new Error(`no kappa fixture ${name}`)
  return { fromPsych, fromStatsmodels }
}

describe('weighted kappa against its published sources', () => {
  it("reproduces Cohen's (1968) kappa .492 and weighted kappa .348", () => {
    // Cohen 1968 (quoted in psych's cohen.kappa examples): κ = .492, κw = .348.
    expect(ok(weightedKappaFromTable(COHEN_COUNTS, 'unweighted')).kappa).toBeCloseTo(0.492, 3)
    const weighted = ok(weightedKappaFromTable(COHEN_COUNTS, COHEN_AGREEMENT))
    expect(weighted.kappa).toBeCloseTo(0.348, 3)
    // Hand arithmetic: Σv·po = 0.90, Σv·pe = 1.38, κw = 1 − 0.90 / 1.38.
    expect(weighted.kappa).toBeCloseTo(1 - 0.9 / 1.38, 12)
  })

  it('reproduces κw = .507 for the table of Fleiss, Cohen & Everitt (1969)', () => {
    // From memory, verify: Fleiss, Cohen & Everitt 1969 report κw = .507 for this table.
    const fce = caseNamed('fleiss-cohen-everitt-1969').fromPsych
    expect(ok(weightedKappaFromTable(fce.table!, fce.weights)).kappa).toBeCloseTo(0.507, 3)
  })
})

describe('weighted kappa against independent implementations (golden fixtures)', () => {
  // Point estimates and the unweighted variance from R psych 2.2.9 (cohen.kappa); the
  // large-sample variance of the weighted kappa (Fleiss, Cohen & Everitt 1969) from statsmodels
  // 0.13.5, because psych 2.2.9 pairs the weights with the wrong marginals in var.weighted.
  it('names the implementations that produced the fixtures', () => {
    expect(psych.generatedBy.psych).toBe('2.2.9')
    expect(statsmodels.generatedBy.statsmodels).toMatch(/^0\.13\.5/)
  })

  for (const { name, note } of psych.kappa) {
    it(`matches kappa, weighted kappa, SE and interval for ${name} (${note})`, () => {
      const { fromPsych, fromStatsmodels } = caseNamed(name)
      const weighted =
        'pairs' in fromPsych && fromPsych.pairs
          ? weightedKappa(
              fromPsych.pairs.map(([a, b]) => [a, b] as [number, number]),
              fromPsych.categories!,
              fromPsych.weights,
            )
          : weightedKappaFromTable(fromPsych.table!, fromPsych.weights)
      const result = ok(weighted)
      expect(result.kappa).toBeCloseTo(fromPsych.weightedKappa, 12)
      expect(result.kappa).toBeCloseTo(fromStatsmodels.weightedKappa, 12)
      expect(result.standardError ** 2).toBeCloseTo(fromStatsmodels.varWeightedKappa, 12)
      expect(result.lower).toBeCloseTo(fromStatsmodels.weightedLower, 10)
      expect(result.upper).toBeCloseTo(Math.min(1, fromStatsmodels.weightedUpper), 10)

      const table =
        'pairs' in fromPsych && fromPsych.pairs
          ? fromPsych.categories!.map((first) =>
              fromPsych.categories!.map(
                (second) => fromPsych.pairs!.filter(([a, b]) => a === first && b === second).length,
              ),
            )
          : fromPsych.table!
      const unweighted = ok(weightedKappaFromTable(table, 'unweighted'))
      expect(unweighted.kappa).toBeCloseTo(fromPsych.kappa, 12)
      expect(unweighted.standardError ** 2).toBeCloseTo(fromPsych.varKappa, 12)
      expect(unweighted.standardError ** 2).toBeCloseTo(fromStatsmodels.varKappa, 12)
    })
  }
})

describe('weights and data handling', () => {
  it('builds linear and quadratic agreement weights (Cohen 1968; Fleiss & Cohen 1973)', () => {
    expect(kappaWeights('linear', 5)[0]).toEqual([1, 0.75, 0.5, 0.25, 0])
    expect(kappaWeights('quadratic', 5)[0]).toEqual([1, 0.9375, 0.75, 0.4375, 0])
    expect(kappaWeights('unweighted', 3)).toEqual([
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
    ])
  })

  it('leaves out pairs with a missing grade and counts them', () => {
    const grades = ['I', 'II', 'III'] as const
    const result = weightedKappa(
      [
        ['I', 'I'],
        ['II', 'II'],
        ['III', 'II'],
        ['I', null],
        [null, 'III'],
      ],
      grades,
      'linear',
    )
    expect(result).toMatchObject({ status: 'ok', n: 3, excluded: 2 })
  })

  it('answers "not enough data" when both raters used one category only', () => {
    const result = weightedKappaFromTable(
      [
        [5, 0],
        [0, 0],
      ],
      'linear',
    )
    expect(result.status).toBe('not-enough-data')
  })

  it('refuses a grade outside the scale', () => {
    expect(() => weightedKappa([['I', 'VI']], ['I', 'II'], 'linear')).toThrow(StatisticsInputError)
  })
})

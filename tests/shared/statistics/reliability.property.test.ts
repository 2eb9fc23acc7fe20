/**
 * Properties the ICC and agreement statistics must have whatever the data [D]: they describe
 * how targets differ relative to how ratings of one target differ, so they cannot depend on the
 * origin or scale of the unit, on the order of targets or of raters; the average-rater forms are
 * the Spearman–Brown step-up of the single-rater forms (Shrout & Fleiss 1979, eq. for ICC(·,k));
 * swapping the two raters of a Bland–Altman comparison mirrors the differences.
 */
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import {
  blandAltman,
  ICC_FORMS,
  intraclassCorrelations,
  weightedKappaFromTable,
  type IccAnalysis,
} from '../../../shared/statistics/index'

/** A measured value rounded to 0.1 of its unit, as the results are. */
const tenths = (min: number, max: number) =>
  fc.integer({ min: min * 10, max: max * 10 }).map((x) => x / 10)

/**
 * Tables of 3–15 targets × 2–5 raters: a value per target plus rating noise of ±5. Targets
 * spread over ±100 or, a quarter of the time, over ±1 only, so that tables whose targets differ
 * less than one target's ratings (negative ICC estimates) are tried too.
 */
const ratingTable = fc
  .tuple(
    fc.integer({ min: 3, max: 15 }),
    fc.integer({ min: 2, max: 5 }),
    fc.constantFrom(100, 100, 100, 1),
  )
  .chain(([n, k, spread]) =>
    fc.tuple(
      fc.array(tenths(-spread, spread), { minLength: n, maxLength: n }),
      fc.array(fc.array(tenths(-5, 5), { minLength: k, maxLength: k }), {
        minLength: n,
        maxLength: n,
      }),
    ),
  )
  .map(([truth, noise]) => truth.map((t, i) => noise[i]!.map((e) => t + e)))

function ok(table: number[][]): IccAnalysis | null {
  const result = intraclassCorrelations(table)
  return result.status === 'ok' ? result : null
}

/**
 * Equal to a relative 1e-7 (F grows without bound as the error vanishes), ±∞ alike, and "not
 * defined" (NaN) alike.
 */
function close(actual: number, expected: number): boolean {
  if (Number.isNaN(expected)) return Number.isNaN(actual)
  if (!Number.isFinite(expected)) return actual === expected
  return Math.abs(actual - expected) <= 1e-7 * Math.max(1, Math.abs(expected))
}

/** The form statistics that differ between two analyses, as "form key" labels. */
function differingForms(a: IccAnalysis, b: IccAnalysis): string[] {
  return ICC_FORMS.flatMap((form) =>
    (['icc', 'lower', 'upper', 'f'] as const)
      .filter((key) => !close(b.forms[form][key], a.forms[form][key]))
      .map((key) => `${form} ${key}`),
  )
}

describe('ICC properties', () => {
  it('does not change when a constant is added to every rating', () => {
    fc.assert(
      fc.property(ratingTable, tenths(-1000, 1000), (table, shift) => {
        const base = ok(table)
        const shifted = ok(table.map((row) => row.map((x) => x + shift)))
        if (!base || !shifted) return
        expect(differingForms(base, shifted)).toEqual([])
      }),
    )
  })

  it('does not change when the unit is rescaled (degrees to radians, mm to cm)', () => {
    fc.assert(
      fc.property(ratingTable, fc.constantFrom(Math.PI / 180, 0.1, 2.54, 25.4), (table, scale) => {
        const base = ok(table)
        const scaled = ok(table.map((row) => row.map((x) => x * scale)))
        if (!base || !scaled) return
        expect(differingForms(base, scaled)).toEqual([])
      }),
    )
  })

  it('does not depend on the order of raters or of targets', () => {
    fc.assert(
      fc.property(ratingTable, fc.integer(), (table, seed) => {
        const base = ok(table)
        if (!base) return
        const raterOrder = table[0]!.map((_, j) => j).reverse()
        const swappedRaters = table.map((row) => raterOrder.map((j) => row[j]!))
        const rotated = Math.abs(seed) % table.length
        const reorderedTargets = [...table.slice(rotated), ...table.slice(0, rotated)]
        expect(differingForms(base, ok(swappedRaters)!)).toEqual([])
        expect(differingForms(base, ok(reorderedTargets)!)).toEqual([])
      }),
    )
  })

  it('steps single-rater forms up to the mean of k raters by Spearman–Brown', () => {
    fc.assert(
      fc.property(ratingTable, (table) => {
        const result = ok(table)
        if (!result) return
        const { k } = result
        const steppedUp = (['1', '2', '3'] as const).map((model) => {
          const single = result.forms[`${model},1`].icc
          const denominator = 1 + (k - 1) * single
          // At or below the step-up's pole −1/(k − 1) the mean of k raters has no reliability
          // the formula could give (it would exceed 1): the module says "not defined" (NaN).
          const expected = denominator <= 1e-9 ? Number.NaN : (k * single) / denominator
          return { model, matches: close(result.forms[`${model},k`].icc, expected) }
        })
        expect(steppedUp.filter((form) => !form.matches)).toEqual([])
      }),
    )
  })

  it('keeps every estimate inside its own confidence interval', () => {
    fc.assert(
      fc.property(ratingTable, (table) => {
        const result = ok(table)
        if (!result) return
        const slack = 1e-12
        const faults = ICC_FORMS.flatMap((form) => {
          const { icc, lower, upper, f } = result.forms[form]
          const undefinedValues = [icc, lower, upper].some((value) => Number.isNaN(value))
          // NaN compares false, so each check below holds only between defined values.
          return [
            // Only the Satterthwaite interval of the absolute-agreement forms can be undefined,
            // and only where the targets differ less than one target's ratings (F below 1).
            undefinedValues && !(form.startsWith('2,') && f < 1) && `${form} undefined at F ${f}`,
            lower > icc + slack && `${form} lower above the estimate`,
            upper < icc - slack && `${form} upper below the estimate`,
            upper > 1 + slack && `${form} upper above 1`,
          ].filter(Boolean)
        })
        expect(faults).toEqual([])
      }),
    )
  })
})

describe('ICC where the targets barely differ', () => {
  // A counterexample fast-check found: three targets whose ratings differ far more within a
  // target than between targets (F = 0.0015). ICC(2,1) is then about −0.29, below the
  // Spearman–Brown pole −1/(k − 1) = −0.25 for five raters.
  const table = [
    [0.6, 0.2, 0.6, 0.6, 0.6],
    [2.3, 0.4, 0.4, 0.8, -1.1],
    [-1.8, -0.3, 2.1, 2.6, 0],
  ]

  it('gives no ICC(2,k) above 1 and no Satterthwaite interval on the wrong side', () => {
    const result = ok(table)!
    expect(result.forms['2,1'].icc).toBeCloseTo(-0.2899, 4)
    expect(result.forms['2,k'].icc).toBeNaN()
    for (const key of ['lower', 'upper'] as const) {
      expect(result.forms['2,1'][key]).toBeNaN()
      expect(result.forms['2,k'][key]).toBeNaN()
    }
  })

  it('keeps the exact F intervals of the other forms around their estimates', () => {
    const result = ok(table)!
    for (const form of ['1,1', '3,1', '1,k', '3,k'] as const) {
      const { icc, lower, upper } = result.forms[form]
      expect(lower).toBeLessThanOrEqual(icc)
      expect(upper).toBeGreaterThanOrEqual(icc)
    }
  })
})

describe('Bland–Altman and kappa properties', () => {
  it('mirrors bias and limits when the two raters swap', () => {
    fc.assert(
      fc.property(ratingTable, (table) => {
        const pairs = table.map((row) => [row[0]!, row[1]!])
        const forward = blandAltman(pairs)
        const backward = blandAltman(pairs.map(([a, b]) => [b!, a!]))
        if (forward.status !== 'ok' || backward.status !== 'ok') return
        expect(backward.bias).toBeCloseTo(-forward.bias, 9)
        expect(backward.sd).toBeCloseTo(forward.sd, 9)
        expect(backward.lower).toBeCloseTo(-forward.upper, 9)
        expect(backward.upper).toBeCloseTo(-forward.lower, 9)
      }),
    )
  })

  it('gives the same symmetric-weight kappa when the raters swap (the table transposed)', () => {
    const counts = fc.array(fc.array(fc.nat({ max: 20 }), { minLength: 4, maxLength: 4 }), {
      minLength: 4,
      maxLength: 4,
    })
    fc.assert(
      fc.property(
        counts,
        fc.constantFrom('linear', 'quadratic', 'unweighted' as const),
        (table, weights) => {
          const transposed = table[0]!.map((_, j) => table.map((row) => row[j]!))
          const a = weightedKappaFromTable(table, weights)
          const b = weightedKappaFromTable(transposed, weights)
          if (a.status !== 'ok' || b.status !== 'ok') return
          expect(b.kappa).toBeCloseTo(a.kappa, 10)
          expect(b.standardError).toBeCloseTo(a.standardError, 10)
        },
      ),
    )
  })
})

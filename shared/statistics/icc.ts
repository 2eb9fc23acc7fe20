import { fQuantile, fUpperTail } from './distributions'
import { completeTargets, type RatingTable } from './rating-table'
import type { NotEnoughData } from './statistics-input-error'
import { twoWayMeanSquares, type MeanSquares } from './two-way-anova'

/**
 * The six forms of Shrout & Fleiss (1979, Psychol Bull 86:420), in their notation: ICC(model,
 * unit). Model 1 is the one-way random model, 2 the two-way random model (absolute agreement),
 * 3 the two-way mixed model (consistency); unit 1 is a single rater's rating, k the mean of the
 * k raters. McGraw & Wong (1996, Psychol Methods 1:30) call them ICC(1), ICC(A,1), ICC(C,1),
 * ICC(k), ICC(A,k), ICC(C,k).
 */
export const ICC_FORMS = ['1,1', '2,1', '3,1', '1,k', '2,k', '3,k'] as const
export type IccForm = (typeof ICC_FORMS)[number]

/** What each form measures, in words for a results table. */
export const ICC_FORM_DESCRIPTIONS: Record<IccForm, string> = {
  '1,1': 'one-way random effects, absolute agreement, single rater',
  '2,1': 'two-way random effects, absolute agreement, single rater',
  '3,1': 'two-way mixed effects, consistency, single rater',
  '1,k': 'one-way random effects, absolute agreement, mean of k raters',
  '2,k': 'two-way random effects, absolute agreement, mean of k raters',
  '3,k': 'two-way mixed effects, consistency, mean of k raters',
}

/** One ICC form with its F test (H0: ICC = 0) and confidence interval; all dimensionless. */
export interface IccEstimate {
  icc: number
  /** Lower confidence bound; can be −∞ for an average-rater form with very few targets. */
  lower: number
  /** Upper confidence bound. */
  upper: number
  /** F statistic; +∞ when the error mean square is 0 (perfect agreement). */
  f: number
  df1: number
  df2: number
  /** Upper-tail p-value of F. */
  p: number
}

export interface IccAnalysis {
  status: 'ok'
  /** Complete targets used. */
  n: number
  /** Raters. */
  k: number
  /** Targets left out for a missing value. */
  excluded: number
  /** Two-sided confidence level of the intervals, e.g. 0.95. */
  confidenceLevel: number
  meanSquares: MeanSquares
  forms: Record<IccForm, IccEstimate>
}

/** Fewest complete targets for which the ANOVA has a residual degree of freedom. */
export const MIN_TARGETS = 2

/**
 * Relative size below which a sum of squares counts as zero (rounding of values that are in
 * fact all equal).
 */
const ZERO_VARIANCE_RELATIVE = 1e-12

export interface IccOptions {
  /** Two-sided confidence level of the intervals; 0.95 unless given. */
  confidenceLevel?: number
}

/**
 * All six ICC forms of a rating table (rows = targets, columns = raters; values in one unit,
 * null for a missing rating). A target with any missing rating is left out and counted in
 * `excluded`. Fewer than {@link MIN_TARGETS} complete targets, no variance at all, or no
 * variance between targets gives a {@link NotEnoughData} answer instead of numbers.
 *
 * Point estimates: Shrout & Fleiss (1979) Table 1 [V]. F tests and confidence intervals: Shrout
 * & Fleiss (1979) and McGraw & Wong (1996) Tables 7–8 [V]; for ICC(2,1) the Satterthwaite
 * degrees of freedom of Fleiss & Shrout (1978), and ICC(2,k) bounds by Spearman–Brown from
 * those of ICC(2,1), as R's psych::ICC computes them (the golden fixtures check this). Where
 * the targets differ less than one target's ratings do, ICC(2,k) past the Spearman–Brown pole
 * and an ICC(2,·) interval the approximation cannot give are NaN ("not defined"), where psych
 * prints the formulas' values (an ICC above 1, bounds beside their estimate).
 */
export function intraclassCorrelations(
  table: RatingTable,
  options: IccOptions = {},
): IccAnalysis | NotEnoughData {
  const confidenceLevel = options.confidenceLevel ?? 0.95
  const { rows, n, k, excluded } = completeTargets(table)
  const notEnough = (reason: string): NotEnoughData => ({
    status: 'not-enough-data',
    reason,
    n,
    k,
    excluded,
  })
  if (n < MIN_TARGETS) {
    return notEnough(
      `${n} complete target${n === 1 ? '' : 's'}; at least ${MIN_TARGETS} are needed`,
    )
  }
  const ms = twoWayMeanSquares(rows)
  const scale = rows.reduce((acc, row) => acc + row.reduce((s, v) => s + v * v, 0), 0)
  if (ms.totalSumOfSquares <= ZERO_VARIANCE_RELATIVE * scale) {
    return notEnough('every rating is the same: there is no variance to apportion')
  }
  if (ms.betweenTargetsSumOfSquares <= ZERO_VARIANCE_RELATIVE * ms.totalSumOfSquares) {
    return notEnough('the targets do not differ (no variance between targets)')
  }
  return {
    status: 'ok',
    n,
    k,
    excluded,
    confidenceLevel,
    meanSquares: ms,
    forms: iccFormsFromMeanSquares(ms, 1 - confidenceLevel),
  }
}

/** (F − 1) / (F + k − 1), with its limit 1 as F → ∞. */
function singleFromF(f: number, k: number): number {
  return f === Infinity ? 1 : (f - 1) / (f + k - 1)
}

/** 1 − 1/F, with its limit 1 as F → ∞. */
function averageFromF(f: number): number {
  return f === Infinity ? 1 : 1 - 1 / f
}

/**
 * Spearman–Brown step-up of a single-rater reliability to the mean of k raters. A bound at or
 * below −1/(k − 1), the pole of the step-up, maps to −∞, the limit from above (possible only for
 * a lower bound with very few targets).
 */
function spearmanBrown(single: number, k: number): number {
  const denominator = 1 + (k - 1) * single
  if (denominator <= 0) return -Infinity
  return (k * single) / denominator
}

/**
 * The Satterthwaite interval of ICC(2,1), or NaN for both bounds ("not defined") where the
 * approximation fails: with targets that barely differ (F well below 1) its degrees of freedom
 * v shrink towards 0, the F quantiles run off towards 1e300, and a bound lands on the wrong side
 * of its own estimate. A researcher then sees no interval rather than a wrong one.
 */
function intervalOrUndefined(lower: number, estimate: number, upper: number): [number, number] {
  const defined =
    Number.isFinite(lower) &&
    Number.isFinite(upper) &&
    lower <= estimate &&
    estimate <= upper &&
    upper <= 1
  return defined ? [lower, upper] : [Number.NaN, Number.NaN]
}

/** The six forms from the mean squares; `alpha` is 1 − the confidence level. */
export function iccFormsFromMeanSquares(
  ms: MeanSquares,
  alpha: number,
): Record<IccForm, IccEstimate> {
  const { n, k } = ms
  const bms = ms.betweenTargets
  const wms = ms.withinTargets
  const jms = ms.betweenRaters
  const ems = ms.residual
  const upperQ = 1 - alpha / 2

  // One-way model: F = BMS / WMS on (n − 1, n(k − 1)).
  const df1 = n - 1
  const dfWithin = n * (k - 1)
  const f1 = wms === 0 ? Infinity : bms / wms
  const p1 = fUpperTail(f1, df1, dfWithin)
  const f1Lower = f1 / fQuantile(upperQ, df1, dfWithin)
  const f1Upper = f1 * fQuantile(upperQ, dfWithin, df1)

  // Two-way models: F = BMS / EMS on (n − 1, (n − 1)(k − 1)).
  const dfResidual = (n - 1) * (k - 1)
  const f3 = ems === 0 ? Infinity : bms / ems
  const p3 = fUpperTail(f3, df1, dfResidual)
  const f3Lower = f3 / fQuantile(upperQ, df1, dfResidual)
  const f3Upper = f3 * fQuantile(upperQ, dfResidual, df1)

  const icc11 = (bms - wms) / (bms + (k - 1) * wms)
  const icc21 = (bms - ems) / (bms + (k - 1) * ems + (k * (jms - ems)) / n)
  const icc31 = (bms - ems) / (bms + (k - 1) * ems)
  const icc1k = (bms - wms) / bms
  // When the targets differ less than the ratings of one target do, the single-rater estimate
  // can fall to or below −1/(k − 1), the pole of the Spearman–Brown step-up; this denominator
  // then turns non-positive and the formula would answer a "reliability" above 1. The
  // average-rater form is not defined there (the single-rater one still is).
  const denominator2k = bms + (jms - ems) / n
  const icc2k = denominator2k > 0 ? (bms - ems) / denominator2k : Number.NaN
  const icc3k = (bms - ems) / bms

  // ICC(2,1): approximate F with Satterthwaite's degrees of freedom v (Fleiss & Shrout 1978;
  // McGraw & Wong 1996 Table 7). As EMS → 0 the ratio vn / vd tends to k − 1.
  let v: number
  if (ems === 0) v = k - 1
  else {
    const fj = jms / ems
    const a = n * (1 + (k - 1) * icc21) - k * icc21
    const vn = (k - 1) * (n - 1) * (k * icc21 * fj + a) ** 2
    const vd = (n - 1) * k * k * icc21 * icc21 * fj * fj + a * a
    v = vn / vd
  }
  const fStarUpper = fQuantile(upperQ, n - 1, v)
  const fStarLower = fQuantile(upperQ, v, n - 1)
  const spread = k * jms + (k * n - k - n) * ems
  // The bounds n(BMS − F*·EMS) / (F*·spread + n·BMS) and n(F*·BMS − EMS) / (spread + n·F*·BMS),
  // written in ratios to EMS (and the lower one divided through by F*), so that they do not
  // depend on the unit and do not overflow when a tiny v sends F* towards 1e300.
  let lower21Raw: number
  let upper21Raw: number
  if (ems === 0) {
    lower21Raw = (n * bms) / (fStarUpper * spread + n * bms)
    upper21Raw = (n * fStarLower * bms) / (spread + n * fStarLower * bms)
  } else {
    const targetsToResidual = bms / ems
    const spreadToResidual = spread / ems
    const scaledTargets = targetsToResidual / fStarUpper
    lower21Raw = (n * (scaledTargets - 1)) / (spreadToResidual + n * scaledTargets)
    upper21Raw =
      (n * (fStarLower * targetsToResidual - 1)) /
      (spreadToResidual + n * fStarLower * targetsToResidual)
  }
  const [lower21, upper21] = intervalOrUndefined(lower21Raw, icc21, upper21Raw)

  const oneWay = { f: f1, df1, df2: dfWithin, p: p1 }
  const twoWay = { f: f3, df1, df2: dfResidual, p: p3 }
  return {
    '1,1': {
      icc: icc11,
      lower: singleFromF(f1Lower, k),
      upper: singleFromF(f1Upper, k),
      ...oneWay,
    },
    '2,1': { icc: icc21, lower: lower21, upper: upper21, ...twoWay },
    '3,1': {
      icc: icc31,
      lower: singleFromF(f3Lower, k),
      upper: singleFromF(f3Upper, k),
      ...twoWay,
    },
    '1,k': { icc: icc1k, lower: averageFromF(f1Lower), upper: averageFromF(f1Upper), ...oneWay },
    '2,k': {
      icc: icc2k,
      // No interval around an estimate that is not defined.
      lower: Number.isNaN(icc2k) ? Number.NaN : spearmanBrown(lower21, k),
      upper: Number.isNaN(icc2k) ? Number.NaN : spearmanBrown(upper21, k),
      ...twoWay,
    },
    '3,k': { icc: icc3k, lower: averageFromF(f3Lower), upper: averageFromF(f3Upper), ...twoWay },
  }
}

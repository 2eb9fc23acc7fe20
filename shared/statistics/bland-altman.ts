import { mean, sampleStandardDeviation } from 'simple-statistics'
import { tQuantile } from './distributions'
import { completeTargets, type RatingTable } from './rating-table'
import { StatisticsInputError, type NotEnoughData } from './statistics-input-error'

/**
 * Multiplier of the SD for the 95 % limits of agreement: 1.96 as in Bland & Altman (1999,
 * Stat Methods Med Res 8:135) [V]; their 1986 Lancet paper rounded it to 2.
 */
export const LIMITS_SD_MULTIPLIER = 1.96

export interface BlandAltmanOptions {
  /** Multiplier of the SD of the differences for the limits; {@link LIMITS_SD_MULTIPLIER} unless given. */
  sdMultiplier?: number
  /** Two-sided confidence level of the intervals around bias and limits; 0.95 unless given. */
  confidenceLevel?: number
}

/** A confidence interval, in the ratings' unit. */
export interface Interval {
  lower: number
  upper: number
}

export interface BlandAltmanResult {
  status: 'ok'
  /** Complete pairs used. */
  n: number
  /** Pairs left out for a missing value. */
  excluded: number
  /** Mean of the differences (first column minus second), in the ratings' unit. */
  bias: number
  /** Sample SD of the differences (n − 1 denominator), in the ratings' unit. */
  sd: number
  /** Lower limit of agreement: bias − multiplier · sd. */
  lower: number
  /** Upper limit of agreement: bias + multiplier · sd. */
  upper: number
  /** Confidence interval of the bias: bias ± t(n − 1) · sd / √n. */
  biasInterval: Interval
  /** Confidence interval of the lower limit. */
  lowerInterval: Interval
  /** Confidence interval of the upper limit. */
  upperInterval: Interval
  sdMultiplier: number
  confidenceLevel: number
}

/**
 * Bland–Altman agreement of two raters (Bland & Altman 1986, Lancet i:307) [V]: a table of
 * exactly two columns (rows = targets), differences taken as first column minus second, in the
 * ratings' unit. Pairs with a missing value are left out and counted in `excluded`; fewer than 2
 * complete pairs gives {@link NotEnoughData}.
 *
 * The confidence interval of each limit uses the variance of bias ± z·s given by Bland & Altman
 * (1999, §2.2) [V-sec]: Var ≈ (1/n + z² / (2(n − 1))) · s², with t(n − 1) as the multiplier of
 * its square root; their 1986 paper approximated the variance as 3s²/n.
 */
export function blandAltman(
  table: RatingTable,
  options: BlandAltmanOptions = {},
): BlandAltmanResult | NotEnoughData {
  const sdMultiplier = options.sdMultiplier ?? LIMITS_SD_MULTIPLIER
  const confidenceLevel = options.confidenceLevel ?? 0.95
  const { rows, n, k, excluded } = completeTargets(table)
  if (k !== 2) {
    throw new StatisticsInputError(`Bland–Altman compares exactly 2 raters; got ${k} columns`)
  }
  if (n < 2) {
    return {
      status: 'not-enough-data',
      reason: `${n} complete pair${n === 1 ? '' : 's'}; at least 2 are needed`,
      n,
      k,
      excluded,
    }
  }
  const differences = rows.map(([first, second]) => (first as number) - (second as number))
  const bias = mean(differences)
  const sd = sampleStandardDeviation(differences)
  const t = tQuantile(1 - (1 - confidenceLevel) / 2, n - 1)
  const biasHalfWidth = (t * sd) / Math.sqrt(n)
  const limitHalfWidth = t * sd * Math.sqrt(1 / n + (sdMultiplier * sdMultiplier) / (2 * (n - 1)))
  const lower = bias - sdMultiplier * sd
  const upper = bias + sdMultiplier * sd
  return {
    status: 'ok',
    n,
    excluded,
    bias,
    sd,
    lower,
    upper,
    biasInterval: { lower: bias - biasHalfWidth, upper: bias + biasHalfWidth },
    lowerInterval: { lower: lower - limitHalfWidth, upper: lower + limitHalfWidth },
    upperInterval: { lower: upper - limitHalfWidth, upper: upper + limitHalfWidth },
    sdMultiplier,
    confidenceLevel,
  }
}

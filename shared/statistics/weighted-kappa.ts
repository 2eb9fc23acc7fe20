import { standardNormalQuantile } from './distributions'
import { StatisticsInputError, type NotEnoughData } from './statistics-input-error'

/**
 * Agreement weights for c ordered categories, w[i][j] in [0, 1] with 1 on the diagonal:
 * 'unweighted' gives Cohen's (1960) kappa; 'linear' w = 1 − |i − j| / (c − 1) and 'quadratic'
 * w = 1 − (i − j)² / (c − 1)² are the usual choices for an ordinal scale (Cohen 1968, Psychol
 * Bull 70:213, with Fleiss & Cohen 1973 for the quadratic form) [M]. A matrix may be given
 * instead, e.g. Cohen's own weights.
 */
export type KappaWeighting = 'unweighted' | 'linear' | 'quadratic'

/** The c × c agreement-weight matrix of a named weighting. */
export function kappaWeights(weighting: KappaWeighting, categoryCount: number): number[][] {
  const c = categoryCount
  return Array.from({ length: c }, (_, i) =>
    Array.from({ length: c }, (_, j) => {
      if (i === j) return 1
      if (weighting === 'unweighted') return 0
      const distance = Math.abs(i - j) / (c - 1)
      return weighting === 'linear' ? 1 - distance : 1 - distance * distance
    }),
  )
}

export interface KappaResult {
  status: 'ok'
  /** Targets rated by both raters. */
  n: number
  /** Targets left out for a missing rating. */
  excluded: number
  /** Weighted kappa, dimensionless. */
  kappa: number
  /** Large-sample standard error of kappa (Fleiss, Cohen & Everitt 1969). */
  standardError: number
  /** Confidence bounds kappa ± z · SE, clipped to [−1, 1]. */
  lower: number
  upper: number
  /** Weighted observed agreement, a proportion. */
  observedAgreement: number
  /** Weighted agreement expected by chance from the two raters' marginals, a proportion. */
  expectedAgreement: number
  confidenceLevel: number
}

export interface KappaOptions {
  /** Two-sided confidence level; 0.95 unless given. */
  confidenceLevel?: number
}

function checkSquare(matrix: unknown, name: string, size?: number): number[][] {
  if (!Array.isArray(matrix) || matrix.length === 0) {
    throw new StatisticsInputError(`${name} must be a non-empty square array of numbers`)
  }
  const c = size ?? matrix.length
  if (matrix.length !== c) throw new StatisticsInputError(`${name} must have ${c} rows`)
  matrix.forEach((row: unknown, i) => {
    if (!Array.isArray(row) || row.length !== c) {
      throw new StatisticsInputError(`${name} row ${i + 1} must hold ${c} numbers`)
    }
    row.forEach((value: unknown, j) => {
      if (typeof value !== 'number' || !Number.isFinite(value)) {
        throw new StatisticsInputError(`${name} [${i + 1}][${j + 1}] is not a finite number`)
      }
    })
  })
  return matrix as number[][]
}

/**
 * Weighted kappa of a c × c table of counts (rows = first rater's category, columns = the
 * second's, categories in scale order) with agreement weights (a named weighting or a c × c
 * matrix, 1 = full agreement). κw = (po − pe) / (1 − pe) with po = ΣΣ w·p and pe = ΣΣ w·pi.·p.j
 * (Cohen 1968) [V-sec]; its large-sample variance, not under the null hypothesis, is that of
 * Fleiss, Cohen & Everitt (1969, Psychol Bull 72:323) [M]:
 *
 *   Var(κw) = [ΣΣ pij (wij − (w̄i. + w̄.j)(1 − κw))² − (κw − pe(1 − κw))²] / (n (1 − pe)²),
 *   w̄i. = Σj p.j wij,  w̄.j = Σi pi. wij.
 *
 * Fewer than 2 rated targets, or a chance agreement of 1 (both raters used one category only),
 * gives {@link NotEnoughData}.
 */
export function weightedKappaFromTable(
  counts: readonly (readonly number[])[],
  weights: KappaWeighting | readonly (readonly number[])[],
  options: KappaOptions & { excluded?: number } = {},
): KappaResult | NotEnoughData {
  const table = checkSquare(counts, 'the table of counts')
  const c = table.length
  const w =
    typeof weights === 'string' ? kappaWeights(weights, c) : checkSquare(weights, 'weights', c)
  if (table.some((row) => row.some((count) => count < 0))) {
    throw new StatisticsInputError('the table of counts cannot hold negative counts')
  }
  const confidenceLevel = options.confidenceLevel ?? 0.95
  const excluded = options.excluded ?? 0
  const n = table.reduce((acc, row) => acc + row.reduce((s, count) => s + count, 0), 0)
  const notEnough = (reason: string): NotEnoughData => ({
    status: 'not-enough-data',
    reason,
    n,
    k: 2,
    excluded,
  })
  if (n < 2)
    return notEnough(`${n} target${n === 1 ? '' : 's'} rated by both; at least 2 are needed`)

  const p = table.map((row) => row.map((count) => count / n))
  const rowMarginal = p.map((row) => row.reduce((s, v) => s + v, 0))
  const columnMarginal = Array.from({ length: c }, (_, j) =>
    p.reduce((s, row) => s + (row[j] as number), 0),
  )
  let observed = 0
  let expected = 0
  for (let i = 0; i < c; i += 1) {
    for (let j = 0; j < c; j += 1) {
      const weight = w[i]![j]!
      observed += weight * p[i]![j]!
      expected += weight * rowMarginal[i]! * columnMarginal[j]!
    }
  }
  if (1 - expected <= 1e-12) {
    return notEnough('both raters used a single category: agreement by chance is already complete')
  }
  const kappa = (observed - expected) / (1 - expected)

  const rowWeightMean = Array.from({ length: c }, (_, i) =>
    w[i]!.reduce((s, weight, j) => s + weight * columnMarginal[j]!, 0),
  )
  const columnWeightMean = Array.from({ length: c }, (_, j) =>
    w.reduce((s, row, i) => s + row[j]! * rowMarginal[i]!, 0),
  )
  let sum = 0
  for (let i = 0; i < c; i += 1) {
    for (let j = 0; j < c; j += 1) {
      const term = w[i]![j]! - (rowWeightMean[i]! + columnWeightMean[j]!) * (1 - kappa)
      sum += p[i]![j]! * term * term
    }
  }
  const variance = Math.max(
    0,
    (sum - (kappa - expected * (1 - kappa)) ** 2) / (n * (1 - expected) ** 2),
  )
  const standardError = Math.sqrt(variance)
  const z = standardNormalQuantile(1 - (1 - confidenceLevel) / 2)
  return {
    status: 'ok',
    n,
    excluded,
    kappa,
    standardError,
    lower: Math.max(-1, kappa - z * standardError),
    upper: Math.min(1, kappa + z * standardError),
    observedAgreement: observed,
    expectedAgreement: expected,
    confidenceLevel,
  }
}

/**
 * Weighted kappa of two raters' categorical ratings: `ratings` has one row per target and two
 * columns (first rater, second rater), each a category from `categories` (listed in scale order,
 * e.g. Meyerding grades I–V) or null when missing. Targets with a missing rating are left out
 * and counted in `excluded`.
 */
export function weightedKappa<Category extends string | number>(
  ratings: ReadonlyArray<readonly [Category | null, Category | null]>,
  categories: readonly Category[],
  weights: KappaWeighting | readonly (readonly number[])[],
  options: KappaOptions = {},
): KappaResult | NotEnoughData {
  if (!Array.isArray(ratings)) throw new StatisticsInputError('ratings must be an array of pairs')
  if (categories.length < 2 || new Set(categories).size !== categories.length) {
    throw new StatisticsInputError('kappa needs at least 2 distinct categories')
  }
  const index = new Map(categories.map((category, i) => [category, i]))
  const counts = categories.map(() => categories.map(() => 0))
  let excluded = 0
  ratings.forEach((pair, row) => {
    if (!Array.isArray(pair) || pair.length !== 2) {
      throw new StatisticsInputError(
        `row ${row + 1} must hold 2 ratings (first rater, second rater)`,
      )
    }
    const [first, second] = pair
    if (first === null || second === null) {
      excluded += 1
      return
    }
    const i = index.get(first)
    const j = index.get(second)
    if (i === undefined || j === undefined) {
      const unknown = i === undefined ? first : second
      throw new StatisticsInputError(
        `row ${row + 1}: ${JSON.stringify(unknown)} is not one of the categories ${categories.join(', ')}`,
      )
    }
    counts[i]![j] = (counts[i]![j] ?? 0) + 1
  })
  return weightedKappaFromTable(counts, weights, { ...options, excluded })
}

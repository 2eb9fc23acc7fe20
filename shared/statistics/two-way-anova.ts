/**
 * Mean squares of the two-way layout without replication (targets × raters), the building
 * blocks of every Shrout & Fleiss (1979) ICC form. Deviations are taken from the grand mean
 * first, so a large constant offset (a lordosis near 50°, a position in pixels) costs no
 * precision.
 */
export interface MeanSquares {
  /** Between targets (BMS; MSR in McGraw & Wong 1996), df = n − 1. Unit²: the ratings' unit squared. */
  betweenTargets: number
  /** Within targets (WMS; MSW), df = n(k − 1): raters and error pooled, as the one-way model has it. */
  withinTargets: number
  /** Between raters (JMS; MSC), df = k − 1. */
  betweenRaters: number
  /** Residual (EMS; MSE), df = (n − 1)(k − 1). */
  residual: number
  /** Total sum of squares about the grand mean. */
  totalSumOfSquares: number
  /** Sum of squares between targets. */
  betweenTargetsSumOfSquares: number
  n: number
  k: number
}

/**
 * Mean squares of a complete rating table: rows = targets, columns = raters, values in the
 * measure's unit. Needs n ≥ 2 rows and k ≥ 2 columns (the caller checks).
 */
export function twoWayMeanSquares(rows: readonly (readonly number[])[]): MeanSquares {
  const n = rows.length
  const k = rows[0]?.length ?? 0
  let sum = 0
  for (const row of rows) for (const value of row) sum += value
  const grandMean = sum / (n * k)
  const rowMeans = rows.map((row) => row.reduce((acc, value) => acc + (value - grandMean), 0) / k)
  const columnMeans = Array.from(
    { length: k },
    (_, j) => rows.reduce((acc, row) => acc + ((row[j] as number) - grandMean), 0) / n,
  )
  let totalSS = 0
  for (const row of rows) for (const value of row) totalSS += (value - grandMean) ** 2
  const rowsSS = k * rowMeans.reduce((acc, mean) => acc + mean * mean, 0)
  const columnsSS = n * columnMeans.reduce((acc, mean) => acc + mean * mean, 0)
  // Rounding can leave a hair below zero when a component is exactly 0.
  const withinSS = Math.max(0, totalSS - rowsSS)
  const residualSS = Math.max(0, totalSS - rowsSS - columnsSS)
  return {
    betweenTargets: rowsSS / (n - 1),
    withinTargets: withinSS / (n * (k - 1)),
    betweenRaters: columnsSS / (k - 1),
    residual: residualSS / ((n - 1) * (k - 1)),
    totalSumOfSquares: totalSS,
    betweenTargetsSumOfSquares: rowsSS,
    n,
    k,
  }
}

import { StatisticsInputError } from './statistics-input-error'

/**
 * Ratings of one measure laid out as rows = targets (the films or patients rated) and
 * columns = raters (or, for intra-rater reliability, the repeated readings of one rater). Every
 * value is in the measure's own unit (degrees, millimetres, percent); null marks a missing
 * rating.
 */
export type RatingTable = ReadonlyArray<ReadonlyArray<number | null>>

/** The complete targets of a rating table, with the count of those left out. */
export interface CompleteRatings {
  /** Rows without a missing value, in their original order. */
  rows: number[][]
  /** Number of complete targets. */
  n: number
  /** Number of raters (columns). */
  k: number
  /** Targets left out because at least one value was null. */
  excluded: number
}

/**
 * Checks the layout of a rating table and keeps the targets rated by every rater (listwise
 * deletion, as the two-way ANOVA behind the ICC needs a complete table). Throws
 * {@link StatisticsInputError} for a table that is not an array of equally long rows of finite
 * numbers or nulls, or that has fewer than `minRaters` columns.
 */
export function completeTargets(table: unknown, minRaters = 2): CompleteRatings {
  if (!Array.isArray(table) || table.length === 0) {
    throw new StatisticsInputError('ratings must be a non-empty array of rows (one per target)')
  }
  let k: number | undefined
  const rows: number[][] = []
  let excluded = 0
  table.forEach((row: unknown, index) => {
    const where = `row ${index + 1}`
    if (!Array.isArray(row)) {
      throw new StatisticsInputError(`${where} is not an array of ratings (one per rater)`)
    }
    if (k === undefined) k = row.length
    else if (row.length !== k) {
      throw new StatisticsInputError(`${where} has ${row.length} ratings; row 1 has ${k}`)
    }
    let complete = true
    row.forEach((value: unknown, column) => {
      if (value === null) complete = false
      else if (typeof value !== 'number' || !Number.isFinite(value)) {
        throw new StatisticsInputError(
          `${where}, column ${column + 1}: ${JSON.stringify(value) ?? String(value)} is neither a finite number nor null`,
        )
      }
    })
    if (complete) rows.push(row as number[])
    else excluded += 1
  })
  const raters = k ?? 0
  if (raters < minRaters) {
    throw new StatisticsInputError(
      `ratings need at least ${minRaters} columns (raters); got ${raters}`,
    )
  }
  return { rows, n: rows.length, k: raters, excluded }
}

/**
 * Thrown for input the statistics refuse outright: a ragged or empty table, a value that is
 * neither a finite number nor null, fewer than two raters, a category outside the scale. Data
 * that are well formed but too few (or without variance) are not an error: the functions answer
 * a {@link NotEnoughData} result instead.
 */
export class StatisticsInputError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'StatisticsInputError'
  }
}

/** The answer, instead of a number, when the data cannot support the statistic. */
export interface NotEnoughData {
  status: 'not-enough-data'
  /** Plain words: what is missing, e.g. "1 complete target; at least 2 are needed". */
  reason: string
  /** Complete targets used (rows without a missing value). */
  n: number
  /** Raters (columns). */
  k: number
  /** Targets left out because at least one of their values was missing. */
  excluded: number
}

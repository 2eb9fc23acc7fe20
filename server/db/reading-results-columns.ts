import { parseJson } from './rows'
import type { ReadingResults } from '../../shared/types/readings'

/**
 * A reading's results are stored in two columns: `results` holds everything but the intervals,
 * `results_uncertainty` the intervals. The uncertainty block is three quarters of a result's
 * bytes, and most readers (exports, plans, trends, reliability statistics) never use it: kept
 * in one column, every one of them had MariaDB read it from off-page storage and send it.
 */
export type ResultsWithoutUncertainty = Omit<ReadingResults, 'uncertainty'>

export interface ResultsColumns {
  results: string
  results_uncertainty: string | null
}

export function toResultsColumns(results: ReadingResults): ResultsColumns {
  const { uncertainty, ...rest } = results
  return {
    results: JSON.stringify(rest),
    results_uncertainty: uncertainty ? JSON.stringify(uncertainty) : null,
  }
}

/** The stored results without the intervals (for readers that never show them). */
export function fromResultsColumn(results: unknown): ResultsWithoutUncertainty {
  return parseJson<ResultsWithoutUncertainty>(results) as ResultsWithoutUncertainty
}

/** The whole stored results: both columns joined again. */
export function fromResultsColumns(results: unknown, uncertainty: unknown): ReadingResults {
  return {
    ...fromResultsColumn(results),
    uncertainty: parseJson<ReadingResults['uncertainty']>(uncertainty) ?? null,
  }
}

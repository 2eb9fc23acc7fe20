import { blandAltman, type BlandAltmanResult } from './bland-altman'
import { intraclassCorrelations, type IccEstimate, type IccForm } from './icc'
import { kooLiInterpretation, type KooLiInterpretation } from './koo-li'
import { measurementError } from './measurement-error'
import type { RatingTable } from './rating-table'
import type { NotEnoughData } from './statistics-input-error'

export interface ReliabilityAnalysis {
  status: 'ok'
  n: number
  k: number
  excluded: number
  confidenceLevel: number
  /** Every form with Koo & Li's (2016) reading of it. */
  forms: Record<IccForm, IccEstimate & { interpretation: KooLiInterpretation }>
  /** Standard error of measurement √MSE (Weir 2005), in the ratings' unit. */
  sem: number
  /** Minimal detectable change 1.96·√2·SEM (Weir 2005), in the ratings' unit. */
  mdc95: number
  /** First column minus second, for two raters only; null otherwise. */
  blandAltman: BlandAltmanResult | null
}

/**
 * Everything the reliability of one continuous measure is reported with: the six ICC forms,
 * their bands, SEM and MDC95, and for two raters the Bland–Altman limits. Layout and units as
 * {@link RatingTable}: rows = targets, columns = raters, one unit throughout.
 */
export function analyseReliability(
  table: RatingTable,
  options: { confidenceLevel?: number } = {},
): ReliabilityAnalysis | NotEnoughData {
  const icc = intraclassCorrelations(table, options)
  if (icc.status !== 'ok') return icc
  const forms = Object.fromEntries(
    Object.entries(icc.forms).map(([form, estimate]) => [
      form,
      { ...estimate, interpretation: kooLiInterpretation(estimate) },
    ]),
  ) as ReliabilityAnalysis['forms']
  const agreement = icc.k === 2 ? blandAltman(table, options) : null
  return {
    status: 'ok',
    n: icc.n,
    k: icc.k,
    excluded: icc.excluded,
    confidenceLevel: icc.confidenceLevel,
    forms,
    ...measurementError(icc.meanSquares),
    // With n ≥ 2 complete rows the pairs are enough too, so this is never "not enough data".
    blandAltman: agreement && agreement.status === 'ok' ? agreement : null,
  }
}

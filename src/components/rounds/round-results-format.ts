import type { KooLiBand } from '@shared/statistics/koo-li'
import { numberText } from '@shared/format/number-text'

/** Plain words for a Koo & Li (2016) band. */
export const BAND_WORDS: Record<KooLiBand, string> = {
  poor: 'Poor reliability',
  moderate: 'Moderate reliability',
  good: 'Good reliability',
  excellent: 'Excellent reliability',
}

export const KOO_LI_CITATION =
  'Koo TK, Li MY. A guideline of selecting and reporting intraclass correlation coefficients for reliability research. J Chiropr Med 2016;15:155–163.'

/** A number to `digits` places, "—" when absent, "∞"/"−∞" for an unbounded interval end. */
export function formatStatistic(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—'
  if (value === Infinity) return '∞'
  if (value === -Infinity) return '−∞'
  // The results' formatter: a rounded zero keeps no sign, a negative value a true minus sign.
  return numberText(value, digits)
}

const notDefined = (value: number | null) => value === null || Number.isNaN(value)

/**
 * "0.71 (0.34 to 0.90)": an estimate with its 95 % confidence interval; "−0.29 (no interval)"
 * when neither bound is defined (the server sends a bound that is not defined as null).
 */
export function formatWithInterval(
  estimate: number | null,
  lower: number | null,
  upper: number | null,
  digits = 2,
): string {
  if (notDefined(lower) && notDefined(upper))
    return `${formatStatistic(estimate, digits)} (no interval)`
  return `${formatStatistic(estimate, digits)} (${formatStatistic(lower, digits)} to ${formatStatistic(upper, digits)})`
}

/** A p value as journals print it: below 0.001 as "< 0.001". */
export function formatPValue(p: number | null): string {
  if (p === null || Number.isNaN(p)) return '—'
  return p < 0.001 ? '< 0.001' : p.toFixed(3)
}

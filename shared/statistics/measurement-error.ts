import type { MeanSquares } from './two-way-anova'

/**
 * z for the 95 % minimal detectable change, as Weir (2005) writes it (1.96, not the exact
 * normal quantile, so published MDC values reproduce).
 */
export const MDC95_Z = 1.96

export interface MeasurementError {
  /** Standard error of measurement, in the ratings' unit. */
  sem: number
  /** Minimal detectable change at 95 % confidence, in the ratings' unit. */
  mdc95: number
}

/**
 * Standard error of measurement and minimal detectable change from the two-way ANOVA of a
 * rating table. SEM = √MSE, the residual mean square of the targets × raters ANOVA (Weir 2005,
 * J Strength Cond Res 19:231, who prefers it to SD·√(1 − ICC) because it does not depend on
 * which ICC form is chosen) [M]; MDC95 = 1.96 · √2 · SEM (Weir 2005): the smallest change
 * between two measurements of one target that exceeds measurement error with 95 % confidence.
 * Systematic differences between raters are not in √MSE; they show in the Bland–Altman bias.
 */
export function measurementError(meanSquares: MeanSquares): MeasurementError {
  const sem = Math.sqrt(meanSquares.residual)
  return { sem, mdc95: MDC95_Z * Math.SQRT2 * sem }
}

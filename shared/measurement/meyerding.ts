import type { MeyerdingGrade, SlipDirection } from '../types/measurement'

/**
 * The grading rule, for display beside the grade (measurement-reference §3): the slip is rounded
 * to 0.1 % half up, then graded with upper-inclusive boundaries.
 */
export const MEYERDING_RULE =
  'slip rounded to 0.1 % (half up): ≤ 0 none; ≤ 25 I; ≤ 50 II; ≤ 75 III; ≤ 100 IV; > 100 V'

/** Upper-inclusive grade boundaries in % of the lower endplate depth, grade I to IV. */
export const MEYERDING_UPPER_BOUNDS_PERCENT = [25, 50, 75, 100] as const

/** Grades in order, for probability tables. */
export const MEYERDING_GRADES: readonly MeyerdingGrade[] = ['I', 'II', 'III', 'IV', 'V']

/**
 * Rounds a slip percentage to 0.1 % half up (towards +∞ at exact halves), the display precision
 * used for grading so that 25.000000001 % from floating-point error does not flip a grade [D].
 * The value is first snapped to 12 significant digits so a decimal half that binary cannot hold
 * exactly (25.05 stored as 25.04999…) rounds as written.
 */
export function roundSlipPercent(slipPercent: number): number {
  const tenths = Number((slipPercent * 10).toPrecision(12))
  return Math.floor(tenths + 0.5) / 10
}

/**
 * Meyerding grade of a slip in % (Meyerding 1932, Surg Gynecol Obstet 54:371 [M]; quarters of
 * the endplate via Butt & Saifuddin 2005 [V]; upper-inclusive boundaries from the 0–25 / 26–50
 * ranges [V-sec]). Null when the rounded slip is ≤ 0 (no anterolisthesis).
 */
export function meyerdingGradeFromSlipPercent(slipPercent: number): MeyerdingGrade | null {
  const rounded = roundSlipPercent(slipPercent)
  if (rounded <= 0) return null
  if (rounded <= 25) return 'I'
  if (rounded <= 50) return 'II'
  if (rounded <= 75) return 'III'
  if (rounded <= 100) return 'IV'
  return 'V'
}

/** Direction after the same rounding: a slip that rounds to 0.0 % is 'none'. */
export function slipDirectionFromSlipPercent(slipPercent: number): SlipDirection {
  const rounded = roundSlipPercent(slipPercent)
  if (rounded > 0) return 'anterolisthesis'
  if (rounded < 0) return 'retrolisthesis'
  return 'none'
}

/** Slip above which it is high-grade, % of the endplate depth (Kasliwal et al. [V]). */
export const HIGH_GRADE_SLIP_PERCENT = 50

/**
 * High-grade slip: > 50 % (Kasliwal et al. [V]), on the rounded value so that it agrees with
 * the grade: exactly 50.0 % is grade II and not high-grade.
 */
export function isHighGradeSlip(slipPercent: number): boolean {
  return roundSlipPercent(slipPercent) > HIGH_GRADE_SLIP_PERCENT
}

import type { ValueWithInterval } from '../types/compare'
import type { ValueInterval } from '../types/measurement'

/**
 * How the interval of a change is formed, in words for the table.
 */
export const DIFFERENCE_INTERVAL_METHOD =
  'change = later − earlier; the two readings are placed on different films, so their placement errors are taken as independent and the 95 % half-widths add in quadrature (the square root of the sum of their squares)'

/**
 * The change from `before` to `after` (after − before, in their common unit) with its 95 %
 * interval. The two values come from landmarks placed on two different films, so their errors
 * are independent: variances add, Var(a − b) = Var(a) + Var(b), and because both half-widths are
 * the same z (1.96) times an SD, the half-width of the change is √(h_before² + h_after²). When
 * either half-width is unknown the change keeps its value and has no interval. Not for two
 * readings of one film by one rater, whose errors are correlated.
 */
export function differenceWithInterval(
  before: ValueWithInterval,
  after: ValueWithInterval,
): ValueWithInterval {
  const halfWidth95 =
    before.halfWidth95 === null || after.halfWidth95 === null
      ? null
      : Math.hypot(before.halfWidth95, after.halfWidth95)
  return { value: after.value - before.value, halfWidth95 }
}

/**
 * A value with the 95 % half-width of the engine's interval ((high − low) / 2); the interval is
 * null where the engine could not form one. Null for a missing or non-finite value.
 */
export function valueWithInterval(
  value: number | null | undefined,
  interval: ValueInterval | null | undefined,
): ValueWithInterval | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null
  return { value, halfWidth95: interval ? (interval.high - interval.low) / 2 : null }
}

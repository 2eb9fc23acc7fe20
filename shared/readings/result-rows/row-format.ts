import type { ValueInterval } from '../../types/measurement'
import { numberWithUnit } from '../../format/number-text'
import { PROBABILITY_CERTAIN_ABOVE, PROBABILITY_NONE_BELOW } from './thresholds'
import type { ResultRow } from './types'

/** The value with its unit through the shared formatter (shared/format); '—' for none. */
export function withUnit(value: number | null | undefined, digits: number, unit: string): string {
  return numberWithUnit(value, digits, unit) ?? '—'
}

function halfWidth(
  interval: ValueInterval | null | undefined,
  digits: number,
  unit: string,
): string | null {
  if (!interval) return null
  const half = (interval.high - interval.low) / 2
  return `± ${withUnit(half, digits, unit)}`
}

/** A row with its value and the half-width of its 95 % interval, both to `digits` places. */
export function row(
  id: string,
  label: string,
  value: number | null | undefined,
  interval: ValueInterval | null | undefined,
  unit: string,
  source: string,
  options: { digits?: number; calibration?: string | null; emphasis?: boolean } = {},
): ResultRow {
  const digits = options.digits ?? 1
  return {
    id,
    label,
    value: withUnit(value, digits, unit),
    interval: value === null || value === undefined ? null : halfWidth(interval, digits, unit),
    calibration: options.calibration ?? null,
    source,
    emphasis: options.emphasis,
  }
}

/** A probability in whole percent; nearly certain or nearly nil reads "> 99 %" or "< 1 %". */
export function percentText(probability: number): string {
  if (probability > PROBABILITY_CERTAIN_ABOVE) return '> 99 %'
  if (probability < PROBABILITY_NONE_BELOW) return '< 1 %'
  return `${Math.round(probability * 100)} %`
}

import type { ValueWithInterval } from '../types/compare'
import { numberWithUnit } from '../format/number-text'

/** Decimal places shown for each unit (one place resolves well below placement error). */
const DIGITS: Record<string, number> = { '%': 1, '°': 1, mm: 1, px: 0 }

/** "27.0°", "25.0 %", "8.1 mm"; "—" for a missing value. True minus signs. */
export function measureText(value: number | null | undefined, unit: string): string {
  return numberWithUnit(value, DIGITS[unit] ?? 1, unit) ?? '—'
}

/** "± 5.6°": the 95 % half-width with its unit; empty when there is none. */
export function halfWidthText(halfWidth95: number | null | undefined, unit: string): string {
  const text = numberWithUnit(halfWidth95, DIGITS[unit] ?? 1, unit)
  return text === null ? '' : `± ${text}`
}

/** "27.0° ± 5.6°", or the value alone without an interval; "—" when missing. */
export function intervalText(measure: ValueWithInterval | null, unit: string): string {
  if (!measure) return '—'
  const spread = halfWidthText(measure.halfWidth95, unit)
  return spread ? `${measureText(measure.value, unit)} ${spread}` : measureText(measure.value, unit)
}

/** A change with its sign: "+8.0°", "−9.0 %", "0.0 %" (no sign on what rounds to zero). */
export function changeText(value: number | null | undefined, unit: string): string {
  const text = measureText(value, unit)
  if (text === '—' || text.startsWith('−') || /^0\.?0*(\D|$)/.test(text)) return text
  return `+${text}`
}

/** A change with its interval: "+8.0° ± 7.9°"; "—" when missing. */
export function changeIntervalText(change: ValueWithInterval | null, unit: string): string {
  if (!change) return '—'
  const spread = halfWidthText(change.halfWidth95, unit)
  return spread ? `${changeText(change.value, unit)} ${spread}` : changeText(change.value, unit)
}

/**
 * The one number formatter of results, overlays, reports and plan labels: fixed `digits`, a
 * true minus sign (U+2212), and no sign on a value that rounds to zero ("−0.0" reads as a sign
 * error).
 */
export function numberText(value: number, digits: number): string {
  const fixed = value.toFixed(digits)
  return /^-0\.?0*$/.test(fixed) ? fixed.slice(1) : fixed.replace('-', '−')
}

/**
 * The number with its unit: degrees attach to it ("12.5°"), other units follow a space
 * ("25.0 %", "4.1 mm"), an empty unit leaves the number alone. Null, undefined or a non-finite
 * value → null, so each caller says how nothing reads ("—", or no label at all).
 */
export function numberWithUnit(
  value: number | null | undefined,
  digits: number,
  unit: string,
): string | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null
  const text = numberText(value, digits)
  if (unit === '') return text
  return unit === '°' ? `${text}°` : `${text} ${unit}`
}

/**
 * A number for an overlay label with its unit: fixed `digits`, a true minus sign, and no sign on
 * a value that rounds to zero ("−0.0" reads as a sign error). Degrees attach to the number
 * ("12.5°"); other units follow a space ("25.0 %"). Null, undefined or non-finite → null.
 */
export function overlayNumberText(
  value: number | null | undefined,
  digits: number,
  unit: string,
): string | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null
  const fixed = value.toFixed(digits)
  const text = /^-0\.?0*$/.test(fixed) ? fixed.slice(1) : fixed.replace('-', '−')
  return unit === '°' ? `${text}°` : `${text} ${unit}`
}

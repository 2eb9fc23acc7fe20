/** Conversions between MariaDB column values and DTO fields. */

/** DATE columns arrive as JS Dates at UTC midnight (connection timezone 'Z'); DTOs use YYYY-MM-DD. */
export function toIsoDate(value: Date | string): string {
  if (typeof value === 'string') return value.slice(0, 10)
  return value.toISOString().slice(0, 10)
}

export function toIsoDateTime(value: Date | string): string {
  return (typeof value === 'string' ? new Date(value) : value).toISOString()
}

export function toIsoDateTimeOrNull(value: Date | string | null): string | null {
  return value === null ? null : toIsoDateTime(value)
}

/** mysql2 returns TINYINT(1) as 0/1. */
export function toBoolean(value: number | boolean): boolean {
  return value === true || value === 1
}

/** DECIMAL columns arrive as strings. */
export function toNumberOrNull(value: string | number | null): number | null {
  return value === null ? null : Number(value)
}

/** Full years between two ISO dates (the birthday counts on its day). */
export function ageInYears(birthDate: string, onDate: string): number {
  const [by, bm, bd] = birthDate.split('-').map(Number) as [number, number, number]
  const [y, m, d] = onDate.split('-').map(Number) as [number, number, number]
  return y - by - (m < bm || (m === bm && d < bd) ? 1 : 0)
}

/**
 * Age for de-identified data: ages above 89 are grouped as 90, as the HIPAA Safe Harbor method
 * does (from memory: 45 CFR 164.514(b)(2)), so a very old patient cannot be singled out.
 */
export function deidentifiedAgeInYears(birthDate: string, onDate: string): number {
  return Math.min(ageInYears(birthDate, onDate), 90)
}

/** JSON columns: mysql2 usually parses them, but MariaDB's LONGTEXT JSON can arrive as text. */
export function parseJson<T>(value: unknown): T | null {
  if (value === null || value === undefined) return null
  return (typeof value === 'string' ? JSON.parse(value) : value) as T
}

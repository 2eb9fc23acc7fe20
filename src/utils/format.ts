import type { Sex, VisitKind } from '@shared/types/domain'

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']

/** "14 Mar 1968" from "1968-03-14": unambiguous whatever the reader's locale habits. */
export function formatDate(isoDate: string | null): string {
  if (!isoDate) return '—'
  const [year, month, day] = isoDate.slice(0, 10).split('-')
  return `${day} ${MONTHS[Number(month) - 1] ?? '?'} ${year}`
}

export function formatDateTime(iso: string): string {
  return new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short' }).format(
    new Date(iso),
  )
}

export const SEX_LABELS: Record<Sex, string> = {
  female: 'Female',
  male: 'Male',
  other: 'Other',
  unknown: 'Not recorded',
}

export const VISIT_KIND_LABELS: Record<VisitKind, string> = {
  'pre-op': 'Pre-op',
  'post-op': 'Post-op',
  'follow-up': 'Follow-up',
}

/** "12 months" or "2 years" for follow-up intervals. */
export function formatInterval(months: number | null): string {
  if (months === null) return ''
  if (months > 0 && months % 12 === 0) return months === 12 ? '1 year' : `${months / 12} years`
  return months === 1 ? '1 month' : `${months} months`
}

export const IMAGE_VIEW_LABELS: Record<import('@shared/types/domain').ImageView, string> = {
  'lateral-neutral': 'Lateral, neutral',
  'lateral-flexion': 'Lateral, flexion',
  'lateral-extension': 'Lateral, extension',
  'lateral-standing-long': 'Lateral, standing long',
  ap: 'AP',
}

/** "64 y"; in de-identified data 90 stands for 90 or older and reads "90+ y". */
export function formatAgeYears(age: number | null, deidentified = false): string {
  if (age === null) return '—'
  return deidentified && age >= 90 ? '90+ y' : `${age} y`
}

/** How long ago, roughly: "just now", "40 min", "5 h", "3 days" (the age of a request). */
export function formatElapsed(iso: string | null, nowMs = Date.now()): string {
  if (!iso) return '—'
  const minutes = Math.max(0, Math.floor((nowMs - Date.parse(iso)) / 60_000))
  if (minutes < 1) return 'just now'
  if (minutes < 60) return `${minutes} min`
  const hours = Math.floor(minutes / 60)
  if (hours < 48) return `${hours} h`
  const days = Math.floor(hours / 24)
  return `${days} days`
}

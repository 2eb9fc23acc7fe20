import type { Visit } from '../types/api'
import type { ImageView, VisitKind } from '../types/domain'

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']

/** "14 Mar 2026" from "2026-03-14": unambiguous in every locale. */
export function dateText(isoDate: string): string {
  const [year, month, day] = isoDate.slice(0, 10).split('-')
  return `${Number(day)} ${MONTHS[Number(month) - 1] ?? '?'} ${year}`
}

export const VISIT_KIND_WORDS: Record<VisitKind, string> = {
  'pre-op': 'Pre-op',
  'post-op': 'Post-op',
  'follow-up': 'Follow-up',
}

export const IMAGE_VIEW_WORDS: Record<ImageView, string> = {
  'lateral-neutral': 'Lateral, neutral',
  'lateral-flexion': 'Lateral, flexion',
  'lateral-extension': 'Lateral, extension',
  'lateral-standing-long': 'Lateral, standing long',
  ap: 'AP',
}

/** "6 months" or "2 years" after surgery. */
export function monthsText(months: number): string {
  if (months > 0 && months % 12 === 0) return months === 12 ? '1 year' : `${months / 12} years`
  return months === 1 ? '1 month' : `${months} months`
}

/**
 * A visit in words: kind and date for clinical roles ("Follow-up · 20 Aug 2026 · 6 months after
 * surgery"); kind, place in the patient's visits and the interval for researchers, who see no
 * dates ("Follow-up · visit 3 · 6 months after surgery").
 */
export function visitText(visit: Visit): string {
  const when = visit.kind === 'identified' ? dateText(visit.visitDate) : `visit ${visit.sequence}`
  const interval =
    visit.monthsSinceSurgery !== null
      ? ` · ${monthsText(visit.monthsSinceSurgery)} after surgery`
      : ''
  return `${VISIT_KIND_WORDS[visit.visitKind]} · ${when}${interval}`
}

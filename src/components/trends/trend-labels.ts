import type { TrendVisit } from '@shared/types/plans'
import { VISIT_KIND_LABELS, formatDate, formatInterval } from '@/utils/format'

/** Two lines under each point: the kind (with the interval for follow-ups), then date or visit no. */
export function visitAxisLabel(visit: TrendVisit): string[] {
  const interval =
    visit.visitKind === 'follow-up' && visit.monthsSinceSurgery !== null
      ? ` ${formatInterval(visit.monthsSinceSurgery)}`
      : ''
  const when = visit.visitDate ? formatDate(visit.visitDate) : `visit ${visit.sequence}`
  return [`${VISIT_KIND_LABELS[visit.visitKind]}${interval}`, when]
}

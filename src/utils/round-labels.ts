import type { RoundKind, RoundStatus, AssignmentStatus, RoundSummary } from '@shared/types/rounds'

export const ROUND_KIND_LABELS: Record<RoundKind, string> = {
  inter: 'Between raters',
  intra: 'Same rater, read again',
}

export const ROUND_STATUS_LABELS: Record<RoundStatus, string> = {
  open: 'In progress',
  closed: 'Closed',
}

export const ASSIGNMENT_STATUS_LABELS: Record<AssignmentStatus, string> = {
  due: 'To read',
  waiting: 'Not open yet',
  done: 'Done',
}

export interface RoundStateTag {
  label: string
  severity: 'info' | 'success' | 'secondary'
}

/**
 * The tag a round wears: an open round whose every reading is in says so (a manager closes it
 * when satisfied), rather than reading "in progress" beside a full progress bar.
 */
export function roundStateTag(
  round: Pick<RoundSummary, 'status' | 'assignmentsDone' | 'assignmentsTotal'>,
): RoundStateTag {
  if (round.status === 'closed') return { label: ROUND_STATUS_LABELS.closed, severity: 'secondary' }
  if (round.assignmentsTotal > 0 && round.assignmentsDone >= round.assignmentsTotal)
    return { label: 'All readings in', severity: 'success' }
  return { label: ROUND_STATUS_LABELS.open, severity: 'info' }
}

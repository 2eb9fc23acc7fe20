import type { RoundKind, RoundStatus, AssignmentStatus } from '@shared/types/rounds'

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

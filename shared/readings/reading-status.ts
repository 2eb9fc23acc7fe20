/**
 * The reading's life: who may do what in which status. The server enforces these rules on every
 * route; the client asks the same function which buttons to show.
 */
import type { ReadingStatus, Role } from '../types/domain'

/** Status names shown to people. */
export const READING_STATUS_LABELS: Record<ReadingStatus, string> = {
  draft: 'Draft',
  submitted: 'Awaiting signature',
  returned: 'Returned for changes',
  signed: 'Signed',
  superseded: 'Replaced by an amendment',
}

export const READING_ACTIONS = ['edit', 'submit', 'sign', 'return', 'amend'] as const
export type ReadingAction = (typeof READING_ACTIONS)[number]

interface ActionRule {
  /** Statuses the action starts from. */
  from: readonly ReadingStatus[]
  roles: readonly Role[]
  /** rater: only the rater; reviewer: anyone allowed but the rater (a second pair of eyes). */
  actor: 'rater' | 'reviewer' | 'anyone'
}

export const READING_ACTION_RULES: Record<ReadingAction, ActionRule> = {
  edit: { from: ['draft', 'returned'], roles: ['surgeon', 'fellow'], actor: 'rater' },
  submit: { from: ['draft', 'returned'], roles: ['surgeon', 'fellow'], actor: 'rater' },
  sign: { from: ['submitted'], roles: ['surgeon'], actor: 'reviewer' },
  return: { from: ['submitted'], roles: ['surgeon'], actor: 'reviewer' },
  amend: { from: ['signed'], roles: ['surgeon', 'fellow'], actor: 'anyone' },
}

export interface ReadingActionRefusal {
  status: 403 | 409
  code: 'forbidden' | 'reading_status'
  message: string
}

const CORRECT_SIGNED =
  'To correct it, start an amendment: a new draft with the same landmarks that replaces this reading once it is signed.'

/** Why a reading in `status` cannot take `action`, in words that say what to do instead. */
function statusMessage(action: ReadingAction, status: ReadingStatus): string {
  if (status === 'signed')
    return `This reading is signed and can no longer change. ${CORRECT_SIGNED}`
  if (status === 'superseded') {
    return 'This reading was replaced by an amendment and can no longer change; open the amendment instead.'
  }
  if (action === 'amend') {
    return `Only a signed reading is amended; this one is ${READING_STATUS_LABELS[status].toLowerCase()}, so it is changed directly${status === 'submitted' ? ' once a surgeon returns it' : ''}.`
  }
  if (status === 'submitted') {
    return 'This reading has been submitted and awaits signature; it changes only if a surgeon returns it.'
  }
  // draft or returned, asked to be signed or returned
  return `Only a reading awaiting signature can be ${action === 'sign' ? 'signed' : 'returned'}; this one is ${READING_STATUS_LABELS[status].toLowerCase()} and must be submitted first.`
}

function actorMessage(action: ReadingAction): string {
  if (action === 'edit' || action === 'submit')
    return 'Only the rater who started this reading can change it.'
  return 'You made this reading; another surgeon signs it off or returns it.'
}

/**
 * Null when `user` may take `action` on the reading now; otherwise the status code and message
 * the server answers with. A role that lacks the action altogether gets 403; a reading in the
 * wrong status gets 409 (it may become possible later); the wrong person gets 403.
 */
export function readingActionRefusal(
  action: ReadingAction,
  reading: { status: ReadingStatus; raterId: number },
  user: { id: number; role: Role },
): ReadingActionRefusal | null {
  const rule = READING_ACTION_RULES[action]
  if (!rule.roles.includes(user.role))
    return { status: 403, code: 'forbidden', message: 'Your role does not allow this.' }
  if (!rule.from.includes(reading.status))
    return { status: 409, code: 'reading_status', message: statusMessage(action, reading.status) }
  const isRater = reading.raterId === user.id
  if ((rule.actor === 'rater' && !isRater) || (rule.actor === 'reviewer' && isRater))
    return { status: 403, code: 'forbidden', message: actorMessage(action) }
  return null
}

/** Readings whose values count as a result (trends, plan evidence, subsidence baselines). */
export const COUNTED_STATUSES: readonly ReadingStatus[] = ['submitted', 'signed']

/** Readings still in the rater's hands. */
export const IN_PROGRESS_STATUSES: readonly ReadingStatus[] = ['draft', 'returned']

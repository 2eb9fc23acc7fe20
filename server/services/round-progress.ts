/**
 * Where each assignment of a round stands. A pass of an intra-rater round opens for a rater only
 * when that rater has finished the previous pass and the gap has passed since their last reading
 * of it: the whole pass at once, so the opening time says nothing about which film is which.
 */
import type { AssignmentRow } from '../db/rounds'
import type { AssignmentStatus, RoundRaterProgress } from '../../shared/types/rounds'

const DAY_MS = 86_400_000

export interface AssignmentState {
  status: AssignmentStatus
  availableFrom: string | null
}

export const isDone = (assignment: AssignmentRow) => assignment.readingStatus === 'submitted'

/** States of the assignments of one round (any subset of its raters), by assignment id. */
export function assignmentStates(
  assignments: readonly AssignmentRow[],
  gapDays: number,
  now: Date,
): Map<number, AssignmentState> {
  const states = new Map<number, AssignmentState>()
  const byRaterPass = new Map<string, AssignmentRow[]>()
  for (const assignment of assignments) {
    const key = `${assignment.raterId}:${assignment.repetition}`
    byRaterPass.set(key, [...(byRaterPass.get(key) ?? []), assignment])
  }
  for (const assignment of assignments) {
    if (isDone(assignment)) {
      states.set(assignment.id, { status: 'done', availableFrom: null })
      continue
    }
    if (assignment.repetition === 1) {
      states.set(assignment.id, { status: 'due', availableFrom: null })
      continue
    }
    const previous = byRaterPass.get(`${assignment.raterId}:${assignment.repetition - 1}`) ?? []
    if (!previous.every(isDone)) {
      states.set(assignment.id, { status: 'waiting', availableFrom: null })
      continue
    }
    const lastMs = Math.max(...previous.map((row) => Date.parse(row.submittedAt ?? '')))
    const opensMs = lastMs + gapDays * DAY_MS
    states.set(
      assignment.id,
      opensMs <= now.getTime()
        ? { status: 'due', availableFrom: null }
        : { status: 'waiting', availableFrom: new Date(opensMs).toISOString() },
    )
  }
  return states
}

/** Counts per rater, in the order of `raters`. */
export function raterProgress(
  raters: ReadonlyArray<{ userId: number; raterCode: string; displayName: string }>,
  assignments: readonly AssignmentRow[],
  states: Map<number, AssignmentState>,
  withIdentity: boolean,
): RoundRaterProgress[] {
  return raters.map((rater) => {
    const counts = { done: 0, due: 0, waiting: 0 }
    for (const assignment of assignments) {
      if (assignment.raterId !== rater.userId) continue
      const state = states.get(assignment.id)
      if (state) counts[state.status] += 1
    }
    return {
      raterCode: rater.raterCode,
      ...(withIdentity ? { userId: rater.userId, displayName: rater.displayName } : {}),
      ...counts,
    }
  })
}

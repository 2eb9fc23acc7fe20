/**
 * What a rater is given of a reading made in a re-reading round: no dates, no free text, and no
 * results before submission when the round says so. Nobody else reads a blinded reading through
 * the readings routes (the round's results are where its values go), and its own rater cannot
 * reopen it while another pass on the same film is still to come.
 */
import type { Db } from '../db/knex'
import type { ReadingRecord } from '../db/readings'
import { findAssignmentByReading, findRound, listRaterAssignments } from '../db/rounds'
import { HttpError, notFound } from '../errors'
import type { Reading, ReadingResults } from '../../shared/types/readings'
import type { Actor } from './audit'
import { isDone } from './round-progress'

/** A blinded reading as its rater sees it. */
export interface BlindedReading extends Omit<Reading, 'results'> {
  /** Null while the round hides results until submission. */
  results: ReadingResults | null
  roundId: number
  blindCode: string
}

export function stripBlindedFields(reading: Reading): Reading {
  return {
    ...reading,
    createdAt: null,
    updatedAt: null,
    submittedAt: null,
    signedAt: null,
    returnedAt: null,
    returnComment: null,
    supersedeReason: null,
  }
}

/**
 * The round and assignment of a blinded reading, refusing anyone but its rater (404: nothing
 * says such a reading exists) and refusing its rater while a later pass on the film is open or
 * waiting (their earlier reading of that film stays out of sight).
 */
export async function loadBlindedContext(
  db: Db,
  actor: Actor,
  reading: Pick<ReadingRecord, 'id' | 'raterId' | 'status'>,
  /** The answer to the rater's own write (the submission itself is always answered). */
  justWritten = false,
) {
  if (reading.raterId !== actor.user.id) throw notFound('reading')
  const assignment = await findAssignmentByReading(db, reading.id)
  const round = assignment ? await findRound(db, assignment.roundId) : undefined
  if (!assignment || !round) throw notFound('reading')
  const later = (await listRaterAssignments(db, actor.user.id)).filter(
    (other) =>
      other.roundId === assignment.roundId &&
      other.imageId === assignment.imageId &&
      other.repetition > assignment.repetition,
  )
  const reopening = reading.status === 'submitted' && !justWritten
  if (reopening && round.status === 'open' && later.some((other) => !isDone(other)))
    throw notFound('reading')
  return { assignment, round }
}

/** A write to a blinded reading needs its round open. */
export function assertRoundOpen(round: { status: string }): void {
  if (round.status !== 'open')
    throw new HttpError(
      409,
      'round_closed',
      'This re-reading round is closed; its readings can no longer change.',
    )
}

export async function toBlindedDto(
  db: Db,
  actor: Actor,
  reading: Reading,
  justWritten = false,
): Promise<BlindedReading> {
  const { assignment, round } = await loadBlindedContext(db, actor, reading, justWritten)
  const hide = !round.options.showResultsBeforeSubmit && reading.status !== 'submitted'
  return {
    ...stripBlindedFields(reading),
    results: hide ? null : reading.results,
    roundId: round.id,
    blindCode: assignment.blindCode,
  }
}

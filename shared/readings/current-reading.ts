import type { ReadingStatus } from '../types/domain'

/**
 * How strongly each status makes a reading the one that stands for its film; higher wins. A
 * signed reading is the record; a submitted one has been finished by its rater; a draft, or a
 * reading returned for changes, is work in progress. A status without a rank never stands for a
 * film, so a status added later is safe until it is ranked here; a reading replaced by a signed
 * amendment (superseded) stays out.
 */
export const CURRENT_READING_RANK: Readonly<Partial<Record<ReadingStatus, number>>> = {
  signed: 3,
  submitted: 2,
  draft: 1,
  returned: 1,
}

/** What the choice needs to know about a reading. */
export interface CurrentReadingCandidate {
  id: number
  status: string
  blinded: boolean
  supersedesId: number | null
}

/** The rank of a status; a status without one never stands for a film (null). */
export function currentReadingRank(status: string): number | null {
  return Object.hasOwn(CURRENT_READING_RANK, status)
    ? (CURRENT_READING_RANK[status as ReadingStatus] ?? null)
    : null
}

/**
 * The reading that stands for a film among the readings made on it: signed before submitted
 * before draft, the newest (highest id: readings are numbered as they are started) within a
 * status. Never a blinded re-reading (it belongs to a reliability round, not to the patient's
 * care), never a status without a rank. An amended reading stays the record until its
 * amendment is signed (it is then superseded, which has no rank), so an amendment still under
 * way never displaces the signed reading it corrects. Null when none qualifies. The choice uses
 * ids only, so every role sees the same reading as current.
 */
export function currentReadingOf<R extends CurrentReadingCandidate>(
  readings: readonly R[],
): R | null {
  let best: R | null = null
  let bestRank = 0
  for (const reading of readings) {
    const rank = currentReadingRank(reading.status)
    if (rank === null || reading.blinded) continue
    if (best === null || rank > bestRank || (rank === bestRank && reading.id > best.id)) {
      best = reading
      bestRank = rank
    }
  }
  return best
}

/**
 * Mails about readings. They leave the hospital's systems, so they never carry a patient's name
 * or record number, nor free text a colleague typed (which might): only the study code, the visit
 * kind and date, and a link that opens the reading after sign-in.
 */
import type { Db } from '../db/knex'
import { findReadingMailContext, findResponsibleSurgeonOfVisit } from '../db/reading-worklist'
import type { ReadingRecord } from '../db/readings'
import { findUsersByIds, listActiveUsersWithRole, type UserRecord } from '../db/users'
import { enqueueMails } from '../db/mail-outbox'
import { listCommenterIds } from '../db/comments'
import { readingTitle } from '../../shared/readings/reading-title'
import type { Actor } from './audit'

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']

/** "2 Sep 2026": unambiguous in every locale. */
export function mailDate(isoDate: string): string {
  const [year, month, day] = isoDate.split('-')
  return `${Number(day)} ${MONTHS[Number(month) - 1] ?? '?'} ${year}`
}

/**
 * The surgeon a submission goes to: the patient's responsible surgeon while active and not the
 * rater; null sends it to every surgeon.
 */
export async function reviewerFor(
  db: Db,
  visitId: number,
  raterId: number,
): Promise<number | null> {
  const surgeonId = await findResponsibleSurgeonOfVisit(db, visitId)
  if (surgeonId === null || surgeonId === raterId) return null
  const [surgeon] = await findUsersByIds(db, [surgeonId])
  return surgeon && surgeon.active && surgeon.role === 'surgeon' ? surgeon.id : null
}

async function queue(
  db: Db,
  reading: ReadingRecord,
  recipients: readonly UserRecord[],
  subject: (title: string, studyCode: string) => string,
  opening: string,
  closing: string,
): Promise<void> {
  const context = await findReadingMailContext(db, reading.id)
  if (!context || recipients.length === 0) return
  const title = readingTitle(reading.template, reading.options)
  const text = [
    opening,
    '',
    `Reading: ${title} (reading ${reading.id})`,
    `Patient: study code ${context.studyCode}`,
    `Visit: ${context.visitKind}, ${mailDate(context.visitDate)}`,
    '',
    closing,
  ].join('\n')
  const unique = new Map(recipients.filter((user) => user.active).map((user) => [user.id, user]))
  await enqueueMails(
    db,
    [...unique.values()].map((user) => ({
      to: user.email,
      subject: subject(title, context.studyCode),
      text,
      linkPath: `/readings/${reading.id}`,
    })),
  )
}

/** Submitted: the surgeon it went to, or every other surgeon when it went to no one. */
export async function notifyReadingSubmitted(
  db: Db,
  reading: ReadingRecord,
  actor: Actor,
): Promise<void> {
  const recipients =
    reading.reviewerId !== null
      ? await findUsersByIds(db, [reading.reviewerId])
      : (await listActiveUsersWithRole(db, 'surgeon')).filter((user) => user.id !== actor.user.id)
  const amendment =
    reading.supersedesId !== null ? ` It amends signed reading ${reading.supersedesId}.` : ''
  await queue(
    db,
    reading,
    recipients,
    (title, code) => `Reading to sign: ${title}, ${code}`,
    `${actor.user.displayName} submitted a reading for your signature.${amendment}`,
    'Open it to check the landmarks, then sign it or return it with a comment.',
  )
}

/** Signed or returned: its rater (unless the rater did it). */
export async function notifyReadingReviewed(
  db: Db,
  reading: ReadingRecord,
  actor: Actor,
  outcome: 'signed' | 'returned',
): Promise<void> {
  if (reading.raterId === actor.user.id) return
  const recipients = await findUsersByIds(db, [reading.raterId])
  if (outcome === 'signed') {
    await queue(
      db,
      reading,
      recipients,
      (title, code) => `Reading signed: ${title}, ${code}`,
      `${actor.user.displayName} signed your reading. It can no longer change; a correction is made as an amendment.`,
      'Open it to see the signed results.',
    )
    return
  }
  await queue(
    db,
    reading,
    recipients,
    (title, code) => `Reading returned for changes: ${title}, ${code}`,
    `${actor.user.displayName} returned your reading with a comment.`,
    'Open it to read the comment, adjust the landmarks and submit it again.',
  )
}

/** A comment: everyone on the reading's side of the conversation but its author. */
export async function notifyReadingComment(
  db: Db,
  reading: ReadingRecord,
  actor: Actor,
): Promise<void> {
  const involved = new Set<number>([reading.raterId, ...(await listCommenterIds(db, reading.id))])
  for (const id of [reading.signedBy, reading.returnedBy, reading.reviewerId]) {
    if (id !== null) involved.add(id)
  }
  involved.delete(actor.user.id)
  await queue(
    db,
    reading,
    await findUsersByIds(db, [...involved]),
    (title, code) => `New comment on a reading: ${title}, ${code}`,
    `${actor.user.displayName} commented on a reading you are involved in.`,
    'Open it to read the comment and answer in the thread beside the results.',
  )
}

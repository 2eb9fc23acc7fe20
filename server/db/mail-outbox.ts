import type { Db } from './knex'
import { TABLES } from './tables'
import { toIsoDateTime, toIsoDateTimeOrNull } from './rows'
import type { UndeliveredMail } from '../../shared/types/mail'

/** A mail to send: plain text, and the page it links to (the sender prefixes PUBLIC_URL). */
export interface OutgoingMail {
  to: string
  subject: string
  text: string
  linkPath: string | null
}

export interface OutboxRow {
  id: number
  to: string
  subject: string
  text: string
  linkPath: string | null
  attempts: number
}

/** Queues mails inside the caller's transaction: they leave only if the action commits. */
export async function enqueueMails(db: Db, mails: readonly OutgoingMail[]): Promise<void> {
  if (mails.length === 0) return
  await db(TABLES.mailOutbox).insert(
    mails.map((mail) => ({
      to_address: mail.to,
      subject: mail.subject.slice(0, 200),
      body_text: mail.text,
      link_path: mail.linkPath,
    })),
  )
}

/** Ids of pending mails whose next attempt is due and that no sender holds. */
export async function dueMailIds(db: Db, now: Date, limit: number): Promise<number[]> {
  const rows = (await db(TABLES.mailOutbox)
    .select('id')
    .where('status', 'pending')
    .where('next_attempt_at', '<=', now)
    .where((where) => where.whereNull('locked_until').orWhere('locked_until', '<', now))
    .orderBy('id', 'asc')
    .limit(limit)) as Array<{ id: number }>
  return rows.map((row) => row.id)
}

/**
 * Claims one mail until `lockedUntil`; null when another sender got it first. A sender that dies
 * mid-send leaves the claim to run out, and the mail is sent again afterwards.
 */
export async function claimMail(
  db: Db,
  id: number,
  now: Date,
  lockedUntil: Date,
): Promise<OutboxRow | null> {
  const claimed = await db(TABLES.mailOutbox)
    .where({ id, status: 'pending' })
    .where((where) => where.whereNull('locked_until').orWhere('locked_until', '<', now))
    .update({ locked_until: lockedUntil })
  if (claimed !== 1) return null
  const row = await db(TABLES.mailOutbox)
    .select('id', 'to_address', 'subject', 'body_text', 'link_path', 'attempts')
    .where({ id })
    .first()
  return {
    id: row.id,
    to: row.to_address,
    subject: row.subject,
    text: row.body_text,
    linkPath: row.link_path,
    attempts: row.attempts,
  }
}

export async function markMailSent(db: Db, id: number, now: Date): Promise<void> {
  await db(TABLES.mailOutbox)
    .where({ id })
    .update({
      status: 'sent',
      sent_at: now,
      attempts: db.raw('attempts + 1'),
      error: null,
      locked_until: null,
      // A delivered link may hold a sign-in token: the outbox keeps no usable copy.
      link_path: null,
      updated_at: now,
    })
}

/** Records a failed attempt: retried at `nextAttemptAt`, or given up (failed) when null. */
export async function markMailAttemptFailed(
  db: Db,
  id: number,
  error: string,
  now: Date,
  nextAttemptAt: Date | null,
): Promise<void> {
  await db(TABLES.mailOutbox)
    .where({ id })
    .update({
      status: nextAttemptAt === null ? 'failed' : 'pending',
      attempts: db.raw('attempts + 1'),
      error: error.slice(0, 500),
      next_attempt_at: nextAttemptAt ?? now,
      locked_until: null,
      updated_at: now,
    })
}

/** Mails not delivered yet: still retrying after a failure, or given up. */
export async function listUndeliveredMails(
  db: Db,
  page: { offset: number; limit: number },
): Promise<{ items: UndeliveredMail[]; total: number }> {
  const query = db(TABLES.mailOutbox).where((where) =>
    where
      .where('status', 'failed')
      .orWhere((pending) => pending.where('status', 'pending').where('attempts', '>', 0)),
  )
  const [{ total }] = (await query.clone().count({ total: '*' })) as [{ total: number | string }]
  const rows = await query
    .select(
      'id',
      'to_address',
      'subject',
      'status',
      'attempts',
      'error',
      'next_attempt_at',
      'created_at',
    )
    .orderBy('id', 'desc')
    .offset(page.offset)
    .limit(page.limit)
  return {
    total: Number(total),
    items: rows.map((row) => ({
      id: row.id,
      to: row.to_address,
      subject: row.subject,
      status: row.status,
      attempts: row.attempts,
      lastError: row.error,
      nextAttemptAt: row.status === 'failed' ? null : toIsoDateTimeOrNull(row.next_attempt_at),
      createdAt: toIsoDateTime(row.created_at),
    })),
  }
}

/** Puts a given-up mail back in the queue, to be tried at once. */
export async function requeueFailedMail(db: Db, id: number, now: Date): Promise<boolean> {
  const changed = await db(TABLES.mailOutbox)
    .where({ id, status: 'failed' })
    .update({ status: 'pending', next_attempt_at: now, locked_until: null, updated_at: now })
  return changed === 1
}

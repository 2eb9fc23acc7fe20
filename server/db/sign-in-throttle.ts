import { createHash } from 'node:crypto'
import type { Db } from './knex'
import { TABLES } from './tables'

/** The throttle's key for a typed address: known and unknown addresses are treated alike. */
export function signInAccountKey(email: string): string {
  return createHash('sha256').update(email.trim().toLowerCase(), 'utf8').digest('hex')
}

/** Longest pause between attempts, however many failures came before. */
export const MAX_SIGN_IN_DELAY_SECONDS = 15 * 60

export type SignInGate = { admitted: true } | { admitted: false; retryAfterSeconds: number }

/**
 * Counts an attempt before its password is checked, in one conditional UPDATE: it succeeds only
 * when no pause is running, so parallel guesses cannot all read the same old count; the rows it
 * changed say whether this attempt may go on. From the `freeFailures`-th failure on, the next
 * attempt waits 1 s, then 2 s, 4 s, ... up to 15 minutes (a pause, not a lock: the right
 * password works as soon as it runs out). A successful sign-in clears the count.
 */
export async function admitSignInAttempt(
  db: Db,
  accountKey: string,
  freeFailures: number,
  now: Date,
): Promise<SignInGate> {
  await db(TABLES.signInThrottle)
    .insert({ account_key: accountKey, failures: 0, next_attempt_at: null, updated_at: now })
    .onConflict('account_key')
    .ignore()
  // MariaDB evaluates SET left to right on the row's new values: the pause is computed first,
  // from the count before this attempt.
  const [result] = (await db.raw(
    `UPDATE ?? SET
       next_attempt_at = IF(failures + 1 >= ?,
         DATE_ADD(?, INTERVAL LEAST(POW(2, failures + 1 - ?), ?) SECOND), NULL),
       failures = failures + 1,
       updated_at = ?
     WHERE account_key = ? AND (next_attempt_at IS NULL OR next_attempt_at <= ?)`,
    [
      TABLES.signInThrottle,
      freeFailures,
      now,
      freeFailures,
      MAX_SIGN_IN_DELAY_SECONDS,
      now,
      accountKey,
      now,
    ],
  )) as [{ affectedRows: number }]
  if (result.affectedRows === 1) return { admitted: true }
  const row = (await db(TABLES.signInThrottle)
    .where({ account_key: accountKey })
    .first('next_attempt_at')) as { next_attempt_at: Date | null } | undefined
  const waitMs = (row?.next_attempt_at?.getTime() ?? now.getTime()) - now.getTime()
  return { admitted: false, retryAfterSeconds: Math.max(1, Math.ceil(waitMs / 1000)) }
}

export async function clearSignInFailures(db: Db, accountKey: string): Promise<void> {
  await db(TABLES.signInThrottle).where({ account_key: accountKey }).delete()
}

export async function signInFailureCount(db: Db, accountKey: string): Promise<number> {
  const row = (await db(TABLES.signInThrottle)
    .where({ account_key: accountKey })
    .first('failures')) as { failures: number } | undefined
  return row?.failures ?? 0
}

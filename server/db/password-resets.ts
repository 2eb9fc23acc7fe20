import type { Db } from './knex'
import { TABLES } from './tables'

export interface PasswordResetRecord {
  id: number
  userId: number
  expiresAt: Date
}

export async function insertPasswordReset(
  db: Db,
  reset: { userId: number; tokenHash: string; expiresAt: Date },
): Promise<void> {
  await db(TABLES.passwordResets).insert({
    user_id: reset.userId,
    token_hash: reset.tokenHash,
    expires_at: reset.expiresAt,
  })
}

/** A reset link not used yet and not expired at `now`. */
export async function findUsableReset(
  db: Db,
  tokenHash: string,
  now: Date,
): Promise<PasswordResetRecord | undefined> {
  const row = await db(TABLES.passwordResets)
    .select('id', 'user_id', 'expires_at')
    .where({ token_hash: tokenHash })
    .whereNull('used_at')
    .where('expires_at', '>', now)
    .first()
  return row ? { id: row.id, userId: row.user_id, expiresAt: row.expires_at } : undefined
}

/** Uses a link up; false when it was used meanwhile (two tabs, two clicks). */
export async function markResetUsed(db: Db, id: number, now: Date): Promise<boolean> {
  const changed = await db(TABLES.passwordResets)
    .where({ id })
    .whereNull('used_at')
    .update({ used_at: now })
  return changed === 1
}

/** Older unused links of a user stop working when a new one is sent. */
export async function retireResetsOf(db: Db, userId: number, now: Date): Promise<void> {
  await db(TABLES.passwordResets)
    .where({ user_id: userId })
    .whereNull('used_at')
    .update({ used_at: now })
}

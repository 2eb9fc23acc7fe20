import type { Db } from '../db/knex'
import { findUserByEmail, findUsersByIds, updateUser } from '../db/users'
import {
  findUsableReset,
  insertPasswordReset,
  markResetUsed,
  retireResetsOf,
} from '../db/password-resets'
import { insertAuditEvent } from '../db/audit'
import { HttpError } from '../errors'
import { hashOneTimeToken, newOneTimeToken } from '../auth/one-time-token'
import type { Clock } from '../clock'
import type { PasswordResetPreview } from '../../shared/types/accounts'
import { assertPasswordAllowed, hashPassword } from './auth'
import { queuePasswordResetMail } from './account-notifications'

export const RESET_LIFETIME_MS = 60 * 60_000

const linkGone = () =>
  new HttpError(
    404,
    'not_found',
    'This password link is no longer valid: it was used already or is more than an hour old. Ask for a new one on the sign-in page.',
  )

/**
 * Mails a one-hour single-use link to an active account. Answers the same whether or not the
 * account exists, so the form tells nobody which addresses have accounts.
 */
export async function requestPasswordReset(
  db: Db,
  email: string,
  ip: string | null,
  now: Clock,
): Promise<void> {
  const user = await findUserByEmail(db, email)
  if (!user || !user.active) {
    await insertAuditEvent(db, {
      userId: null,
      action: 'password-reset-requested',
      entity: 'user',
      entityId: null,
      summary: 'Password reset asked for an address without an active account; nothing sent',
      ip,
    })
    return
  }
  const { token, hash } = newOneTimeToken()
  await db.transaction(async (trx) => {
    await retireResetsOf(trx, user.id, now())
    await insertPasswordReset(trx, {
      userId: user.id,
      tokenHash: hash,
      expiresAt: new Date(now().getTime() + RESET_LIFETIME_MS),
    })
    await queuePasswordResetMail(trx, { email: user.email, displayName: user.displayName, token })
    await insertAuditEvent(trx, {
      userId: user.id,
      action: 'password-reset-requested',
      entity: 'user',
      entityId: user.id,
      summary: 'Password reset link mailed (valid 1 hour)',
      ip,
    })
  })
}

export async function previewPasswordReset(
  db: Db,
  token: string,
  now: Clock,
): Promise<PasswordResetPreview> {
  const reset = await findUsableReset(db, hashOneTimeToken(token), now())
  const [user] = reset ? await findUsersByIds(db, [reset.userId]) : []
  if (!reset || !user || !user.active) throw linkGone()
  return { email: user.email, expiresAt: reset.expiresAt.toISOString() }
}

/** Sets the password, uses the link up and ends every session the user had. */
export async function completePasswordReset(
  db: Db,
  token: string,
  password: string,
  ip: string | null,
  now: Clock,
): Promise<void> {
  const reset = await findUsableReset(db, hashOneTimeToken(token), now())
  const [user] = reset ? await findUsersByIds(db, [reset.userId]) : []
  if (!reset || !user || !user.active) throw linkGone()
  assertPasswordAllowed(password, user.email)
  const passwordHash = await hashPassword(password)
  await db.transaction(async (trx) => {
    if (!(await markResetUsed(trx, reset.id, now()))) throw linkGone()
    await updateUser(trx, user.id, { passwordHash, endSessions: true })
    await insertAuditEvent(trx, {
      userId: user.id,
      action: 'password-reset',
      entity: 'user',
      entityId: user.id,
      summary: 'Password set through a reset link; every session ended',
      ip,
    })
  })
}

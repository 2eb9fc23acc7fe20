import bcrypt from 'bcryptjs'
import type { Db } from '../db/knex'
import { findUserForLogin, recordFailedLogin, recordSuccessfulLogin } from '../db/users'
import { badRequest, HttpError } from '../errors'
import { insertAuditEvent } from '../db/audit'
import { revokeSession } from '../db/revoked-sessions'
import { audit, type Actor } from './audit'
import type { LoginInput, SessionUser } from '../../shared/types/api'
import type { Clock } from '../clock'
import { passwordProblem } from '../../shared/accounts/password-rules'

/** A signed-in user and the session generation their token must carry. */
export interface SignedInUser {
  user: SessionUser
  sessionGeneration: number
}

/** One message for every failure, so the answer never tells which accounts exist or are locked. */
export const LOGIN_FAILED_MESSAGE =
  'Sign-in failed. Check the e-mail address and password; after repeated failures an account is locked for 15 minutes.'

export const LOCKOUT_MINUTES = 15

// A real bcrypt hash of a random string, compared against when the e-mail is unknown so that
// both paths take the same time.
const DUMMY_HASH = '$2b$10$VYe2/tfujan3AC2uoVOx5ONcz6MjdIk7YRz6pds63uX7v1RLCKM9O'

export async function login(
  db: Db,
  input: LoginInput,
  maxFailures: number,
  ip: string | null,
): Promise<SignedInUser> {
  const user = await findUserForLogin(db, input.email)
  const passwordMatches = await bcrypt.compare(input.password, user?.passwordHash ?? DUMMY_HASH)
  const locked =
    user?.lockedUntil !== null && user?.lockedUntil !== undefined && user.lockedUntil > new Date()
  // Once a lock has run out, counting starts again from zero.
  const lockExpired = user?.lockedUntil !== null && user?.lockedUntil !== undefined && !locked
  if (!user || !user.active || locked || !passwordMatches) {
    if (user && user.active && !locked) {
      const failuresSoFar = lockExpired ? 0 : user.failedAttempts
      const reachesLimit = failuresSoFar + 1 >= maxFailures
      const lockUntil = reachesLimit ? new Date(Date.now() + LOCKOUT_MINUTES * 60_000) : null
      await recordFailedLogin(db, user.id, lockUntil, lockExpired)
      if (reachesLimit) {
        await insertAuditEvent(db, {
          userId: user.id,
          action: 'lockout',
          entity: 'user',
          entityId: user.id,
          summary: `Locked for ${LOCKOUT_MINUTES} minutes after ${maxFailures} failed sign-ins`,
          ip,
        })
      }
    }
    await insertAuditEvent(db, {
      userId: user?.id ?? null,
      action: 'login-failed',
      entity: 'user',
      entityId: user?.id ?? null,
      summary: 'Failed sign-in',
      ip,
    })
    throw new HttpError(401, 'login_failed', LOGIN_FAILED_MESSAGE)
  }
  await recordSuccessfulLogin(db, user.id)
  await insertAuditEvent(db, {
    userId: user.id,
    action: 'login',
    entity: 'user',
    entityId: user.id,
    summary: 'Signed in',
    ip,
  })
  return {
    user: { id: user.id, email: user.email, displayName: user.displayName, role: user.role },
    sessionGeneration: user.sessionGeneration,
  }
}

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, 10)
}

/** The rules for a new password (set from an invitation or a reset link); 400 naming the rule. */
export function assertPasswordAllowed(password: string, email: string): void {
  const problem = passwordProblem(password, email)
  if (problem) throw badRequest(`password: ${problem}`, { password: [`password: ${problem}`] })
}

/**
 * Ends a sign-in. Tokens are stateless, so the session id is refused until the latest token of
 * that session would have expired (a renewal extends it by the lifetime at most).
 */
export async function logout(
  db: Db,
  actor: Actor,
  session: { id: string; expiresAt: Date } | null,
  lifetimeMinutes: number,
  now: Clock,
): Promise<void> {
  if (session) {
    const latestExpiry = new Date(
      Math.max(session.expiresAt.getTime(), now().getTime() + lifetimeMinutes * 60_000),
    )
    await revokeSession(db, session.id, latestExpiry)
  }
  await audit(db, actor, 'logout', 'user', actor.user.id, 'Signed out')
}

import bcrypt from 'bcryptjs'
import type { Db } from '../db/knex'
import { findUserForLogin, recordSuccessfulLogin, updatePasswordHash } from '../db/users'
import {
  admitSignInAttempt,
  clearSignInFailures,
  signInAccountKey,
  signInFailureCount,
} from '../db/sign-in-throttle'
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

/** One message for every failure, so the answer never tells which accounts exist. */
export const LOGIN_FAILED_MESSAGE =
  'Sign-in failed. Check the e-mail address and password; after repeated failures each further attempt has to wait a little longer.'

/** Work factor of new hashes; OWASP's password storage cheat sheet asks for at least 10. */
export const BCRYPT_COST = 12

// A real bcrypt hash (cost 12) of a random string, compared against when the e-mail is unknown
// so that both paths do the same work.
export const DUMMY_HASH = '$2b$12$mq2U7vgspbGdd2sF2/mi3u/45fIVRf3S0twup9fgRMut0jtmm30rK'

export type SignInOutcome =
  ({ kind: 'signed-in' } & SignedInUser) | { kind: 'delayed'; retryAfterSeconds: number }

export interface SignInOptions {
  /** Failures before each further attempt has to wait (LOGIN_MAX_FAILURES). */
  freeFailures: number
  ip: string | null
  now: Clock
}

/**
 * Checks a sign-in. The attempt is counted before the password is compared (see
 * admitSignInAttempt), and known and unknown addresses go through the same steps: the count,
 * the account look-up and one bcrypt comparison.
 */
export async function login(
  db: Db,
  input: LoginInput,
  options: SignInOptions,
): Promise<SignInOutcome> {
  const accountKey = signInAccountKey(input.email)
  const gate = await admitSignInAttempt(db, accountKey, options.freeFailures, options.now())
  if (!gate.admitted) return { kind: 'delayed', retryAfterSeconds: gate.retryAfterSeconds }
  const user = await findUserForLogin(db, input.email)
  const passwordMatches = await bcrypt.compare(input.password, user?.passwordHash ?? DUMMY_HASH)
  if (!user || !user.active || !passwordMatches) {
    if (user && (await signInFailureCount(db, accountKey)) === options.freeFailures) {
      await insertAuditEvent(db, {
        userId: user.id,
        action: 'lockout',
        entity: 'user',
        entityId: user.id,
        summary: `Further sign-ins paused, growing from 1 s, after ${options.freeFailures} failed sign-ins`,
        ip: options.ip,
      })
    }
    await insertAuditEvent(db, {
      userId: user?.id ?? null,
      action: 'login-failed',
      entity: 'user',
      entityId: user?.id ?? null,
      summary: 'Failed sign-in',
      ip: options.ip,
    })
    throw new HttpError(401, 'login_failed', LOGIN_FAILED_MESSAGE)
  }
  await clearSignInFailures(db, accountKey)
  await recordSuccessfulLogin(db, user.id)
  // Hashes made at a lower cost are upgraded while the password is at hand.
  if (bcrypt.getRounds(user.passwordHash) < BCRYPT_COST)
    await updatePasswordHash(db, user.id, await hashPassword(input.password))
  await insertAuditEvent(db, {
    userId: user.id,
    action: 'login',
    entity: 'user',
    entityId: user.id,
    summary: 'Signed in',
    ip: options.ip,
  })
  return {
    kind: 'signed-in',
    user: { id: user.id, email: user.email, displayName: user.displayName, role: user.role },
    sessionGeneration: user.sessionGeneration,
  }
}

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST)
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

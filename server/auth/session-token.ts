import { randomBytes } from 'node:crypto'
import jwt from 'jsonwebtoken'
import type { Role } from '../../shared/types/domain'

export const SESSION_COOKIE = 'endplate_session'

export interface SessionClaims {
  sub: string
  role: Role
  /** One id per sign-in, kept across sliding renewals, so signing out ends every copy. */
  sid: string
  /** The user's session generation at sign-in; a raised generation ends the session. */
  gen?: number
  iat: number
  exp: number
}

export interface TokenSettings {
  secret: string
  lifetimeMinutes: number
}

export function newSessionId(): string {
  return randomBytes(16).toString('hex')
}

/** Signs a short-lived session token (HS256) naming the user, the role and the session. */
export function signSessionToken(
  userId: number,
  role: Role,
  settings: TokenSettings,
  sessionId = newSessionId(),
  generation = 0,
): string {
  return jwt.sign({ role, sid: sessionId, gen: generation }, settings.secret, {
    algorithm: 'HS256',
    subject: String(userId),
    expiresIn: settings.lifetimeMinutes * 60,
  })
}

/** Verifies signature and expiry; returns null for anything that does not check out. */
export function verifySessionToken(token: string, secret: string): SessionClaims | null {
  try {
    const claims = jwt.verify(token, secret, { algorithms: ['HS256'] })
    if (
      typeof claims === 'string' ||
      typeof claims.sub !== 'string' ||
      typeof claims.sid !== 'string'
    )
      return null
    return claims as SessionClaims
  } catch {
    return null
  }
}

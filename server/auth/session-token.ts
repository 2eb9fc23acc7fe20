import jwt from 'jsonwebtoken'
import type { Role } from '../../shared/types/domain'

export const SESSION_COOKIE = 'endplate_session'

export interface SessionClaims {
  sub: string
  role: Role
  iat: number
  exp: number
}

export interface TokenSettings {
  secret: string
  lifetimeMinutes: number
}

/** Signs a short-lived session token (HS256) naming the user and the role at sign-in. */
export function signSessionToken(userId: number, role: Role, settings: TokenSettings): string {
  return jwt.sign({ role }, settings.secret, {
    algorithm: 'HS256',
    subject: String(userId),
    expiresIn: settings.lifetimeMinutes * 60,
  })
}

/** Verifies signature and expiry; returns null for anything that does not check out. */
export function verifySessionToken(token: string, secret: string): SessionClaims | null {
  try {
    const claims = jwt.verify(token, secret, { algorithms: ['HS256'] })
    if (typeof claims === 'string' || typeof claims.sub !== 'string') return null
    return claims as SessionClaims
  } catch {
    return null
  }
}

import type { CookieOptions, RequestHandler, Response } from 'express'
import type { Db } from '../db/knex'
import { findUserById } from '../db/users'
import { isSessionRevoked } from '../db/revoked-sessions'
import { unauthorized } from '../errors'
import { tagHandler } from './handler-tags'
import {
  SESSION_COOKIE,
  signSessionToken,
  verifySessionToken,
  type TokenSettings,
} from '../auth/session-token'
import type { Role } from '../../shared/types/domain'

export interface SessionCookieSettings extends TokenSettings {
  secureCookie: boolean
}

export function sessionCookieOptions(settings: SessionCookieSettings): CookieOptions {
  return {
    httpOnly: true,
    sameSite: 'strict',
    secure: settings.secureCookie,
    path: '/',
    maxAge: settings.lifetimeMinutes * 60_000,
  }
}

export function setSessionCookie(
  res: Response,
  user: { id: number; role: Role; sessionGeneration: number },
  settings: SessionCookieSettings,
  sessionId?: string,
): void {
  res.cookie(
    SESSION_COOKIE,
    signSessionToken(user.id, user.role, settings, sessionId, user.sessionGeneration),
    sessionCookieOptions(settings),
  )
}

/**
 * Checks the session cookie and loads the account on every request, so a deactivated user, a
 * changed role or ended sessions take effect at once although the token itself is stateless. Past half its
 * lifetime the token is renewed (sliding expiry).
 */
export function authenticate(db: Db, settings: SessionCookieSettings): RequestHandler {
  const handler: RequestHandler = async (req, res, next) => {
    const token: unknown = req.cookies?.[SESSION_COOKIE]
    if (typeof token !== 'string' || token.length === 0) throw unauthorized()
    const claims = verifySessionToken(token, settings.secret)
    if (!claims) throw unauthorized('Your session has expired or is invalid. Please sign in again.')
    if (await isSessionRevoked(db, claims.sid))
      throw unauthorized('You have signed out. Please sign in again.')
    const user = await findUserById(db, Number(claims.sub))
    if (!user || !user.active) throw unauthorized('This account is not active.')
    if ((claims.gen ?? 0) !== user.sessionGeneration)
      throw unauthorized('This session was ended (a new password was set). Please sign in again.')
    req.user = { id: user.id, email: user.email, displayName: user.displayName, role: user.role }
    req.session = { id: claims.sid, expiresAt: new Date(claims.exp * 1000) }
    const halfLifeSeconds = (settings.lifetimeMinutes * 60) / 2
    if (claims.exp - Date.now() / 1000 < halfLifeSeconds)
      setSessionCookie(res, user, settings, claims.sid)
    next()
  }
  return tagHandler(handler, { session: true })
}

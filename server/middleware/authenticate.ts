import type { CookieOptions, Request, RequestHandler, Response } from 'express'
import type { Db } from '../db/knex'
import { findSessionAccount } from '../db/users'
import { unauthorized } from '../errors'
import { tagHandler } from './handler-tags'
import {
  sessionCookieName,
  signSessionToken,
  verifySessionToken,
  type TokenSettings,
} from '../auth/session-token'
import { loadSiteSettings } from '../services/site-settings'
import type { Clock } from '../clock'
import type { Role } from '../../shared/types/domain'

export interface SessionCookieSettings extends TokenSettings {
  /** Served over HTTPS (PUBLIC_URL https): Secure flag and the __Host- cookie name. */
  secureCookie: boolean
}

export function sessionCookieOptions(
  settings: SessionCookieSettings,
  maxAgeSeconds = settings.lifetimeMinutes * 60,
): CookieOptions {
  return {
    httpOnly: true,
    sameSite: 'strict',
    secure: settings.secureCookie,
    path: '/',
    maxAge: Math.max(0, maxAgeSeconds) * 1000,
  }
}

export function sessionCookieOf(req: Request, settings: SessionCookieSettings): string | null {
  const token: unknown = req.cookies?.[sessionCookieName(settings.secureCookie)]
  return typeof token === 'string' && token.length > 0 ? token : null
}

/** When a session that began at `signedInAtSeconds` must end, whatever the activity. */
export async function absoluteSessionEndSeconds(
  db: Db,
  signedInAtSeconds: number,
): Promise<number> {
  const { sessionAbsoluteHours } = await loadSiteSettings(db)
  return signedInAtSeconds + sessionAbsoluteHours * 3600
}

export function setSessionCookie(
  res: Response,
  user: { id: number; role: Role; sessionGeneration: number },
  settings: SessionCookieSettings,
  session: {
    nowSeconds: number
    signedInAtSeconds: number
    notAfterSeconds: number
    sessionId?: string
  },
): void {
  const token = signSessionToken(user.id, user.role, settings, {
    sessionId: session.sessionId,
    generation: user.sessionGeneration,
    nowSeconds: session.nowSeconds,
    signedInAtSeconds: session.signedInAtSeconds,
    notAfterSeconds: session.notAfterSeconds,
  })
  const expiresAtSeconds = Math.min(
    session.nowSeconds + settings.lifetimeMinutes * 60,
    session.notAfterSeconds,
  )
  res.cookie(
    sessionCookieName(settings.secureCookie),
    token,
    sessionCookieOptions(settings, expiresAtSeconds - session.nowSeconds),
  )
}

export const SESSION_TOO_OLD_MESSAGE =
  'You have been signed in for the longest time a session may last. Please sign in again.'

/**
 * Checks the session cookie and loads the account on every request, so a deactivated user, a
 * changed role or ended sessions take effect at once although the token itself is stateless. Past
 * half its lifetime the token is renewed (sliding expiry), but never beyond the absolute lifetime
 * counted from sign-in: a stolen cookie cannot be kept alive by using it.
 */
export function authenticate(db: Db, settings: SessionCookieSettings, now: Clock): RequestHandler {
  const handler: RequestHandler = async (req, res, next) => {
    const token = sessionCookieOf(req, settings)
    if (token === null) throw unauthorized()
    const nowSeconds = Math.floor(now().getTime() / 1000)
    const claims = verifySessionToken(token, settings, nowSeconds)
    if (!claims) throw unauthorized('Your session has expired or is invalid. Please sign in again.')
    const account = await findSessionAccount(db, Number(claims.sub), claims.sid)
    if (account?.sessionRevoked) throw unauthorized('You have signed out. Please sign in again.')
    const user = account?.user
    if (!user || !user.active) throw unauthorized('This account is not active.')
    if ((claims.gen ?? 0) !== user.sessionGeneration)
      throw unauthorized('This session was ended (a new password was set). Please sign in again.')
    const halfLifeSeconds = (settings.lifetimeMinutes * 60) / 2
    if (claims.exp - nowSeconds < halfLifeSeconds) {
      const notAfterSeconds = await absoluteSessionEndSeconds(db, claims.auth_time)
      if (notAfterSeconds <= nowSeconds) throw unauthorized(SESSION_TOO_OLD_MESSAGE)
      // Only renew when it moves the expiry on; at the absolute end the token simply runs out.
      if (Math.min(nowSeconds + halfLifeSeconds * 2, notAfterSeconds) > claims.exp)
        setSessionCookie(res, user, settings, {
          nowSeconds,
          signedInAtSeconds: claims.auth_time,
          notAfterSeconds,
          sessionId: claims.sid,
        })
    }
    req.user = { id: user.id, email: user.email, displayName: user.displayName, role: user.role }
    req.session = {
      id: claims.sid,
      expiresAt: new Date(claims.exp * 1000),
      signedInAt: new Date(claims.auth_time * 1000),
    }
    next()
  }
  return tagHandler(handler, { session: true })
}

/** Sets the cookie of a new sign-in: its absolute lifetime starts now. */
export async function startSession(
  res: Response,
  db: Db,
  user: { id: number; role: Role; sessionGeneration: number },
  settings: SessionCookieSettings,
  now: Clock,
): Promise<void> {
  const nowSeconds = Math.floor(now().getTime() / 1000)
  setSessionCookie(res, user, settings, {
    nowSeconds,
    signedInAtSeconds: nowSeconds,
    notAfterSeconds: await absoluteSessionEndSeconds(db, nowSeconds),
  })
}

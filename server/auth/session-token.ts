import { createSecretKey, randomBytes, type KeyObject } from 'node:crypto'
import jwt from 'jsonwebtoken'
import type { Role } from '../../shared/types/domain'

export const SESSION_COOKIE = 'endplate_session'
/**
 * Over HTTPS the cookie carries the __Host- prefix: browsers then accept it only with Secure,
 * Path=/ and no Domain, so a sibling subdomain or a plain-HTTP page cannot plant or shadow it
 * (RFC 6265bis §4.1.3.2).
 */
export const HOST_SESSION_COOKIE = `__Host-${SESSION_COOKIE}`

export function sessionCookieName(secure: boolean): string {
  return secure ? HOST_SESSION_COOKIE : SESSION_COOKIE
}

/** What a session token is for: a token minted by the same key for anything else is refused. */
export const SESSION_AUDIENCE = 'endplate-session'

export interface SessionClaims {
  sub: string
  role: Role
  /** One id per sign-in, kept across sliding renewals, so signing out ends every copy. */
  sid: string
  /** The user's session generation at sign-in; a raised generation ends the session. */
  gen?: number
  /** When the user signed in (seconds since the epoch), kept across renewals. */
  auth_time: number
  iat: number
  exp: number
  iss: string
  aud: string
}

export interface TokenSettings {
  secret: string
  lifetimeMinutes: number
  /** This deployment (its public address): a token of another deployment is refused. */
  issuer: string
}

/** The token settings of a configuration; tests and benches sign with the same ones. */
export function tokenSettingsOf(config: {
  JWT_SECRET: string
  SESSION_MINUTES: number
  publicUrl: string
}): TokenSettings {
  return {
    secret: config.JWT_SECRET,
    lifetimeMinutes: config.SESSION_MINUTES,
    issuer: config.publicUrl,
  }
}

export function newSessionId(): string {
  return randomBytes(16).toString('hex')
}

export interface SessionTokenFacts {
  sessionId?: string
  generation?: number
  /** Now, in seconds; the signing time of the token. */
  nowSeconds?: number
  /** Sign-in time in seconds; now for a new sign-in. */
  signedInAtSeconds?: number
  /** Latest expiry allowed (the absolute session end), in seconds. */
  notAfterSeconds?: number
}

let cachedKey: { secret: string; key: KeyObject } | null = null

/**
 * The signing key as a KeyObject, made once per secret: given a string, jsonwebtoken first tries
 * it as a public key on every call and builds a secret key from it when that throws, which was a
 * tenth of the server's time under load.
 */
function signingKeyOf(secret: string): KeyObject {
  if (cachedKey?.secret !== secret) cachedKey = { secret, key: createSecretKey(secret, 'utf8') }
  return cachedKey.key
}

/** Signs a short-lived session token (HS256) naming the user, the role and the session. */
export function signSessionToken(
  userId: number,
  role: Role,
  settings: TokenSettings,
  facts: SessionTokenFacts = {},
): string {
  const nowSeconds = facts.nowSeconds ?? Math.floor(Date.now() / 1000)
  const exp = Math.min(
    nowSeconds + settings.lifetimeMinutes * 60,
    facts.notAfterSeconds ?? Number.POSITIVE_INFINITY,
  )
  return jwt.sign(
    {
      role,
      sid: facts.sessionId ?? newSessionId(),
      gen: facts.generation ?? 0,
      auth_time: facts.signedInAtSeconds ?? nowSeconds,
      iat: nowSeconds,
      exp,
    },
    signingKeyOf(settings.secret),
    {
      algorithm: 'HS256',
      subject: String(userId),
      issuer: settings.issuer,
      audience: SESSION_AUDIENCE,
    },
  )
}

/**
 * Verifies signature, expiry, issuer and audience at `nowSeconds`; null for anything that does
 * not check out.
 */
export function verifySessionToken(
  token: string,
  settings: TokenSettings,
  nowSeconds = Math.floor(Date.now() / 1000),
): SessionClaims | null {
  try {
    const claims = jwt.verify(token, signingKeyOf(settings.secret), {
      algorithms: ['HS256'],
      issuer: settings.issuer,
      audience: SESSION_AUDIENCE,
      clockTimestamp: nowSeconds,
    })
    if (
      typeof claims === 'string' ||
      typeof claims.sub !== 'string' ||
      typeof claims.sid !== 'string' ||
      typeof claims.auth_time !== 'number'
    )
      return null
    return claims as SessionClaims
  } catch {
    return null
  }
}

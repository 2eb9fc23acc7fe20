import { Router, type RequestHandler } from 'express'
import { rateLimit } from 'express-rate-limit'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import {
  sessionCookieOf,
  startSession,
  type SessionCookieSettings,
} from '../middleware/authenticate'
import { sessionCookieName } from '../auth/session-token'
import { loadSiteSettings } from '../services/site-settings'
import type { MeAnswer } from '../../shared/types/api'
import { loginBody } from '../schemas/auth'
import { passwordBody, passwordResetRequestBody, tokenParam } from '../schemas/accounts'
import { login, logout } from '../services/auth'
import {
  completePasswordReset,
  previewPasswordReset,
  requestPasswordReset,
} from '../services/password-reset'
import type { Clock } from '../clock'
import { actorOf } from './actor'

export interface AuthRouterOptions {
  db: Db
  now: Clock
  session: SessionCookieSettings
  authenticate: RequestHandler
  maxFailures: number
  loginsPerMinute: number
}

/** Per-address limit on anonymous account requests (sign-in, reset and invitation links). */
export function accountRequestLimiter(perMinute: number, what: string): RequestHandler {
  return rateLimit({
    windowMs: 60_000,
    limit: perMinute,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    message: {
      error: {
        code: 'rate_limited',
        message: `Too many ${what}. Wait a minute and try again.`,
      },
    },
  })
}

export function authRouter(options: AuthRouterOptions): Router {
  const router = Router()
  const loginLimiter = accountRequestLimiter(options.loginsPerMinute, 'sign-in attempts')
  const resetLimiter = accountRequestLimiter(options.loginsPerMinute, 'password requests')

  router.post('/login', loginLimiter, validate('body', loginBody), async (req, res) => {
    const signedIn = await login(options.db, req.body, options.maxFailures, req.ip ?? null)
    await startSession(
      res,
      options.db,
      { ...signedIn.user, sessionGeneration: signedIn.sessionGeneration },
      options.session,
      options.now,
    )
    res.json(signedIn.user)
  })

  router.post(
    '/password-reset',
    resetLimiter,
    validate('body', passwordResetRequestBody),
    async (req, res) => {
      await requestPasswordReset(options.db, req.body.email, req.ip ?? null, options.now)
      res.status(202).json({
        message:
          'If an active account uses this address, a link to choose a new password is on its way. It works once, within an hour.',
      })
    },
  )

  router.get(
    '/password-reset/:token',
    resetLimiter,
    validate('params', tokenParam),
    async (_req, res) => {
      res.json(await previewPasswordReset(options.db, res.locals.params.token, options.now))
    },
  )

  router.post(
    '/password-reset/:token',
    resetLimiter,
    validate('params', tokenParam),
    validate('body', passwordBody),
    async (req, res) => {
      await completePasswordReset(
        options.db,
        res.locals.params.token,
        req.body.password,
        req.ip ?? null,
        options.now,
      )
      res.status(204).end()
    },
  )

  router.post('/logout', options.authenticate, async (req, res) => {
    await logout(
      options.db,
      actorOf(req),
      req.session ?? null,
      options.session.lifetimeMinutes,
      options.now,
    )
    res.clearCookie(sessionCookieName(options.session.secureCookie), {
      path: '/',
      httpOnly: true,
      sameSite: 'strict',
      secure: options.session.secureCookie,
    })
    // The browser drops what it cached while signed in (films, lists) on this device.
    res.setHeader('Clear-Site-Data', '"cache"')
    res.status(204).end()
  })

  // A visitor without a session cookie is an ordinary state (the sign-in page asks first), not an
  // error: 200 with no user. A cookie that no longer checks out still answers 401.
  router.get(
    '/me',
    (req, res, next) => {
      if (sessionCookieOf(req, options.session) !== null)
        return options.authenticate(req, res, next)
      const answer: MeAnswer = { user: null, session: null }
      res.json(answer)
    },
    async (req, res) => {
      const { idleSignOutMinutes, sessionAbsoluteHours } = await loadSiteSettings(options.db)
      const signedInAt = req.session!.signedInAt
      const answer: MeAnswer = {
        user: req.user!,
        session: {
          signedInAt: signedInAt.toISOString(),
          endsAt: new Date(signedInAt.getTime() + sessionAbsoluteHours * 3_600_000).toISOString(),
          idleSignOutMinutes,
        },
      }
      res.json(answer)
    },
  )

  return router
}

import { Router, type RequestHandler } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import {
  sessionCookieOf,
  startSession,
  type SessionCookieSettings,
} from '../middleware/authenticate'
import { sessionCookieName } from '../auth/session-token'
import { loadSiteSettings } from '../services/site-settings'
import type { LoginInput, MeAnswer } from '../../shared/types/api'
import {
  answerTooMany,
  consumeOrRefuse,
  limitPerAddress,
  sharedLimiter,
} from '../middleware/rate-limit'
import { signInAccountKey } from '../db/sign-in-throttle'

const TOO_MANY_FOR_ACCOUNT =
  'Too many sign-in attempts for this address. Wait a while and try again.'
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
  attemptsPerAccountHour: number
}

export function authRouter(options: AuthRouterOptions): Router {
  const router = Router()
  const { db } = options
  const loginLimiter = limitPerAddress(
    db,
    'signin-address',
    options.loginsPerMinute,
    'sign-in attempts',
  )
  const resetLimiter = limitPerAddress(
    db,
    'reset-address',
    options.loginsPerMinute,
    'password requests',
  )
  // A budget per typed address, whoever sends it: spreading guesses over many addresses of the
  // network does not buy more tries at one account.
  const accountLimiter = sharedLimiter(db, 'signin-account', options.attemptsPerAccountHour, 3600)

  router.post('/login', loginLimiter, validate('body', loginBody), async (req, res) => {
    const body = req.body as LoginInput
    const accountKey = signInAccountKey(body.email)
    if (!(await consumeOrRefuse(accountLimiter, accountKey, res, TOO_MANY_FOR_ACCOUNT))) return
    const outcome = await login(db, body, {
      freeFailures: options.maxFailures,
      ip: req.ip ?? null,
      now: options.now,
    })
    if (outcome.kind === 'delayed') {
      answerTooMany(
        res,
        outcome.retryAfterSeconds,
        `Too many failed sign-ins for this address. Try again in ${outcome.retryAfterSeconds} s.`,
      )
      return
    }
    await startSession(
      res,
      db,
      { ...outcome.user, sessionGeneration: outcome.sessionGeneration },
      options.session,
      options.now,
    )
    res.json(outcome.user)
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

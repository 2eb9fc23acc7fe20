import { Router, type RequestHandler } from 'express'
import { rateLimit } from 'express-rate-limit'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { setSessionCookie, type SessionCookieSettings } from '../middleware/authenticate'
import { SESSION_COOKIE } from '../auth/session-token'
import { loginBody } from '../schemas/auth'
import { login, logout } from '../services/auth'
import { actorOf } from './actor'

export interface AuthRouterOptions {
  db: Db
  session: SessionCookieSettings
  authenticate: RequestHandler
  maxFailures: number
  loginsPerMinute: number
}

export function authRouter(options: AuthRouterOptions): Router {
  const router = Router()
  const loginLimiter = rateLimit({
    windowMs: 60_000,
    limit: options.loginsPerMinute,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    message: {
      error: {
        code: 'rate_limited',
        message: 'Too many sign-in attempts. Wait a minute and try again.',
      },
    },
  })

  router.post('/login', loginLimiter, validate('body', loginBody), async (req, res) => {
    const user = await login(options.db, req.body, options.maxFailures, req.ip ?? null)
    setSessionCookie(res, user.id, user.role, options.session)
    res.json(user)
  })

  router.post('/logout', options.authenticate, async (req, res) => {
    await logout(options.db, actorOf(req), req.session ?? null, options.session.lifetimeMinutes)
    res.clearCookie(SESSION_COOKIE, {
      path: '/',
      httpOnly: true,
      sameSite: 'strict',
      secure: options.session.secureCookie,
    })
    res.status(204).end()
  })

  router.get('/me', options.authenticate, (req, res) => {
    res.json(req.user)
  })

  return router
}

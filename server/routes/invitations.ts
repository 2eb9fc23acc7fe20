import { Router, type RequestHandler } from 'express'
import type { Db } from '../db/knex'
import type { Clock } from '../clock'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { startSession, type SessionCookieSettings } from '../middleware/authenticate'
import { idParam } from '../schemas/common'
import { invitationBody, passwordBody, tokenParam } from '../schemas/accounts'
import {
  acceptInvitation,
  createInvitation,
  listInvitations,
  previewInvitation,
  revokeInvitation,
} from '../services/invitations'
import { actorOf } from './actor'

export interface InvitationsRouterOptions {
  db: Db
  now: Clock
  session: SessionCookieSettings
  authenticate: RequestHandler
  /** Limits how often anonymous callers may try links. */
  linkLimiter: RequestHandler
}

/** Administrators invite; the invited person opens the link without an account. */
export function invitationsRouter(options: InvitationsRouterOptions): Router {
  const { db, now } = options
  const router = Router()
  const admin = [options.authenticate, requirePermission('user:manage')]

  router.get('/', ...admin, async (_req, res) => {
    res.json(await listInvitations(db, now))
  })

  router.post('/', ...admin, validate('body', invitationBody), async (req, res) => {
    res.status(201).json(await createInvitation(db, actorOf(req), req.body, now))
  })

  router.delete('/:id', ...admin, validate('params', idParam), async (req, res) => {
    await revokeInvitation(db, actorOf(req), res.locals.params.id, now)
    res.status(204).end()
  })

  router.get('/:token', options.linkLimiter, validate('params', tokenParam), async (_req, res) => {
    res.json(await previewInvitation(db, res.locals.params.token, now))
  })

  router.post(
    '/:token/accept',
    options.linkLimiter,
    validate('params', tokenParam),
    validate('body', passwordBody),
    async (req, res) => {
      const signedIn = await acceptInvitation(
        db,
        res.locals.params.token,
        req.body.password,
        req.ip ?? null,
        now,
      )
      await startSession(
        res,
        db,
        { ...signedIn.user, sessionGeneration: signedIn.sessionGeneration },
        options.session,
        now,
      )
      res.status(201).json(signedIn.user)
    },
  )

  return router
}

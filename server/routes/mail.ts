import { Router } from 'express'
import type { Db } from '../db/knex'
import type { Clock } from '../clock'
import { requirePermission } from '../middleware/require-permission'
import { validate } from '../middleware/validate'
import { idParam } from '../schemas/common'
import { mailListQuery } from '../schemas/mail'
import { readCaughtMail, readUndeliveredMail, resendMail } from '../services/mail'
import { actorOf } from './actor'

/** Administrators only: the outbox's undelivered mail, and the fake server's catches. */
export function mailRouter(db: Db, options: { fakeOn: boolean; now: Clock }): Router {
  const router = Router()
  router.use(requirePermission('mail:read'))
  router.get('/', validate('query', mailListQuery), async (_req, res) => {
    res.json(await readCaughtMail(db, options.fakeOn, res.locals.query))
  })
  router.get('/undelivered', validate('query', mailListQuery), async (_req, res) => {
    res.json(await readUndeliveredMail(db, res.locals.query))
  })
  router.post('/undelivered/:id/resend', validate('params', idParam), async (req, res) => {
    await resendMail(db, actorOf(req), res.locals.params.id, options.now)
    res.status(204).end()
  })
  return router
}

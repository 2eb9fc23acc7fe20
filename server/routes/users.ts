import { Router } from 'express'
import type { Db } from '../db/knex'
import { requirePermission } from '../middleware/require-permission'
import { validate } from '../middleware/validate'
import { idParam } from '../schemas/common'
import { userPatchBody } from '../schemas/accounts'
import { listSurgeons, listUserSummaries, patchUser } from '../services/users'
import { actorOf } from './actor'

export function usersRouter(db: Db): Router {
  const router = Router()
  router.get('/', requirePermission('user:manage'), async (_req, res) => {
    res.json(await listUserSummaries(db))
  })
  // Clinicians pick a patient's responsible surgeon from these.
  router.get('/surgeons', requirePermission('patient:write'), async (_req, res) => {
    res.json(await listSurgeons(db))
  })
  router.patch(
    '/:id',
    requirePermission('user:manage'),
    validate('params', idParam),
    validate('body', userPatchBody),
    async (req, res) => {
      res.json(await patchUser(db, actorOf(req), res.locals.params.id, req.body))
    },
  )
  return router
}

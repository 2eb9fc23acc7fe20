import { Router } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import { patchVisitBody } from '../schemas/visits'
import { getVisit, patchVisit } from '../services/visits'
import { actorOf } from './actor'

export function visitsRouter(db: Db): Router {
  const router = Router()

  router.get('/:id', requirePermission('patient:read'), validate('params', idParam), async (req, res) => {
    res.json(await getVisit(db, actorOf(req), res.locals.params.id))
  })

  router.patch('/:id', requirePermission('visit:write'), validate('params', idParam), validate('body', patchVisitBody), async (req, res) => {
    res.json(await patchVisit(db, actorOf(req), res.locals.params.id, req.body))
  })

  return router
}

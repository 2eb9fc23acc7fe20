import { Router } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import { planSegmentBody, planSegmentParams } from '../schemas/plans'
import { getPlan, savePlanSegment } from '../services/plans'
import { getTrends } from '../services/trends'
import { actorOf } from './actor'

/** Mounted at /api/patients: a patient's plan, segment by segment, and its trends across visits. */
export function plansRouter(db: Db): Router {
  const router = Router()

  router.get(
    '/:id/plan',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getPlan(db, actorOf(req), res.locals.params.id))
    },
  )

  router.put(
    '/:id/plan/:segment',
    requirePermission('plan:write'),
    validate('params', planSegmentParams),
    validate('body', planSegmentBody),
    async (req, res) => {
      const { id, segment } = res.locals.params
      res.json(await savePlanSegment(db, actorOf(req), id, segment, req.body))
    },
  )

  router.get(
    '/:id/trends',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getTrends(db, actorOf(req), res.locals.params.id))
    },
  )

  return router
}

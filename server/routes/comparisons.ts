import { Router } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { comparisonQuery, type ComparisonQuery } from '../schemas/comparisons'
import { compareImages } from '../services/comparisons'
import { actorOf } from './actor'

/** Mounted at /api/comparisons: two films of one patient with their differences; reads only. */
export function comparisonsRouter(db: Db): Router {
  const router = Router()
  router.get(
    '/',
    requirePermission('patient:read'),
    validate('query', comparisonQuery),
    async (req, res) => {
      const query = res.locals.query as ComparisonQuery
      res.json(
        await compareImages(
          db,
          actorOf(req),
          query.images as [number, number],
          query.readings ?? [],
        ),
      )
    },
  )
  return router
}

import { Router } from 'express'
import type { Db } from '../db/knex'
import { requirePermission } from '../middleware/require-permission'
import { listRoundRaterCandidates } from '../services/round-raters'

/** Mounted at /api/rounds: who may be asked to rate in a new round. */
export function roundRatersRouter(db: Db): Router {
  const router = Router()
  router.get('/rater-candidates', requirePermission('round:manage'), async (_req, res) => {
    res.json(await listRoundRaterCandidates(db))
  })
  return router
}

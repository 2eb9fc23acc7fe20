import { Router } from 'express'
import type { Db } from '../db/knex'
import { requirePermission } from '../middleware/require-permission'
import { listUserSummaries } from '../services/users'

export function usersRouter(db: Db): Router {
  const router = Router()
  router.get('/', requirePermission('user:manage'), async (_req, res) => {
    res.json(await listUserSummaries(db))
  })
  return router
}

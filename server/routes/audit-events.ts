import { Router } from 'express'
import type { Db } from '../db/knex'
import { checkAuditChain, readAuditTrail } from '../services/audit-trail'
import { requirePermission } from '../middleware/require-permission'
import { validate } from '../middleware/validate'
import { auditQuery } from '../schemas/audit'

export function auditEventsRouter(db: Db): Router {
  const router = Router()
  router.get(
    '/',
    requirePermission('audit:read'),
    validate('query', auditQuery),
    async (_req, res) => {
      res.json(await readAuditTrail(db, res.locals.query))
    },
  )
  router.get('/chain', requirePermission('audit:read'), async (_req, res) => {
    res.json(await checkAuditChain(db))
  })
  return router
}

import { Router } from 'express'
import type { Db } from '../db/knex'
import type { HealthStatus } from '../../shared/types/api'
import { APP_VERSION } from '../version'

/** Public: load balancers and the start script poll it. */
export function healthRouter(db: Db): Router {
  const router = Router()
  router.get('/', async (_req, res) => {
    try {
      const [completed, pending] = (await db.migrate.list()) as [unknown[], unknown[]]
      const body: HealthStatus = {
        status: pending.length === 0 ? 'ok' : 'degraded',
        database: 'up',
        migrations: { applied: completed.length, pending: pending.length },
        version: APP_VERSION,
      }
      res.json(body)
    } catch {
      const body: HealthStatus = {
        status: 'degraded',
        database: 'down',
        migrations: null,
        version: APP_VERSION,
      }
      res.status(503).json(body)
    }
  })
  return router
}

import { Router } from 'express'
import type { Db } from '../db/knex'
import type { HealthStatus } from '../../shared/types/api'
import { APP_VERSION } from '../version'
import { RETRY_AFTER_SECONDS } from '../middleware/error-handler'

/** How long the health probe waits for the database before it reports it down. */
export const HEALTH_PROBE_MS = 1_500

function within<T>(work: Promise<T>, ms: number): Promise<T> {
  let timer: NodeJS.Timeout | undefined
  const late = new Promise<never>((_resolve, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms)
  })
  return Promise.race([work, late]).finally(() => clearTimeout(timer))
}

/**
 * Public: load balancers and the start script poll it. It answers within HEALTH_PROBE_MS
 * whatever the database does: a paused MariaDB, or a pool full of requests waiting on it, is
 * reported down at once rather than by a hanging probe.
 */
export function healthRouter(db: Db): Router {
  const router = Router()
  router.get('/', async (_req, res) => {
    try {
      const [completed, pending] = (await within(
        db.raw('SELECT 1').then(() => db.migrate.list()),
        HEALTH_PROBE_MS,
      )) as [unknown[], unknown[]]
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
      res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS))
      res.status(503).json(body)
    }
  })
  return router
}

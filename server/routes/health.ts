import { Router, type RequestHandler } from 'express'
import type { Db } from '../db/knex'
import type { HealthDetails, HealthStatus } from '../../shared/types/api'
import { APP_VERSION } from '../version'
import { RETRY_AFTER_SECONDS } from '../middleware/error-handler'
import { requirePermission } from '../middleware/require-permission'

/** How long the health probe waits for the database before it reports it down. */
export const HEALTH_PROBE_MS = 1_500

function within<T>(work: Promise<T>, ms: number): Promise<T> {
  let timer: NodeJS.Timeout | undefined
  const late = new Promise<never>((_resolve, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms)
  })
  return Promise.race([work, late]).finally(() => clearTimeout(timer))
}

/** Probes the database and its migrations within HEALTH_PROBE_MS; never throws. */
async function probe(db: Db): Promise<HealthDetails> {
  try {
    const [completed, pending] = (await within(
      db.raw('SELECT 1').then(() => db.migrate.list()),
      HEALTH_PROBE_MS,
    )) as [unknown[], unknown[]]
    return {
      status: pending.length === 0 ? 'ok' : 'degraded',
      database: 'up',
      migrations: { applied: completed.length, pending: pending.length },
      version: APP_VERSION,
    }
  } catch {
    return { status: 'degraded', database: 'down', migrations: null, version: APP_VERSION }
  }
}

/**
 * `/` is public: load balancers poll it. It answers within HEALTH_PROBE_MS whatever the
 * database does: a paused MariaDB, or a pool full of requests waiting on it, is reported down at
 * once rather than by a hanging probe. It says up or down only; the version and migration counts
 * (which tell an attacker which build runs) are at `/details`, for a signed-in administrator.
 */
export function healthRouter(db: Db, requireSession: RequestHandler): Router {
  const router = Router()
  router.get('/', async (_req, res) => {
    const { status, database } = await probe(db)
    const body: HealthStatus = { status, database }
    if (database === 'down') res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS))
    res.status(database === 'down' ? 503 : 200).json(body)
  })
  router.get('/details', requireSession, requirePermission('system:inspect'), async (_req, res) => {
    const body = await probe(db)
    if (body.database === 'down') res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS))
    res.status(body.database === 'down' ? 503 : 200).json(body)
  })
  return router
}

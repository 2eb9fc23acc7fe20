import type { Request, RequestHandler, Response } from 'express'
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible'
import type { Db } from '../db/knex'
import { TABLES } from '../db/tables'

/**
 * A limiter whose counters live in the project's MariaDB (table rate_limits), so every server
 * process in front of the same database counts against one budget.
 */
export function sharedLimiter(
  db: Db,
  name: string,
  points: number,
  durationSeconds: number,
): RateLimiterMySQL {
  const connection = db.client.config.connection as { database: string }
  return new RateLimiterMySQL({
    storeClient: db,
    storeType: 'knex',
    dbName: connection.database,
    tableName: TABLES.rateLimits,
    // The migration creates the table; the limiter must not try to create databases.
    tableCreated: true,
    keyPrefix: name,
    points,
    duration: durationSeconds,
  })
}

/** Answers 429 with Retry-After in whole seconds (RFC 9110 §10.2.3). */
export function answerTooMany(res: Response, retryAfterSeconds: number, message: string): void {
  res.setHeader('Retry-After', String(Math.max(1, Math.ceil(retryAfterSeconds))))
  res.status(429).json({ error: { code: 'rate_limited', message } })
}

/**
 * Takes one point for the request's key; false (and the 429 sent) once the budget is spent.
 * Database failures propagate, so an unreachable database answers like any other (503).
 */
export async function consumeOrRefuse(
  limiter: RateLimiterMySQL,
  key: string,
  res: Response,
  message: string,
): Promise<boolean> {
  try {
    await limiter.consume(key)
    return true
  } catch (rejection) {
    if (!(rejection instanceof RateLimiterRes)) throw rejection
    answerTooMany(res, rejection.msBeforeNext / 1000, message)
    return false
  }
}

/** Per-address limit on anonymous account requests (sign-in, reset and invitation links). */
export function limitPerAddress(
  db: Db,
  name: string,
  perMinute: number,
  what: string,
): RequestHandler {
  const limiter = sharedLimiter(db, name, perMinute, 60)
  return async (req: Request, res, next) => {
    if (await consumeOrRefuse(limiter, req.ip ?? 'unknown', res, tooMany(what))) next()
  }
}

export function tooMany(what: string): string {
  return `Too many ${what}. Wait a minute and try again.`
}

import type { Request, RequestHandler } from 'express'
import type { Db } from '../db/knex'
import { insertAuditEvent } from '../db/audit'

/**
 * Reads every role's audit records: film lists, renditions, readings and plans. Researchers'
 * reads are recorded whatever they open. Each pattern names the record the event is filed under.
 */
const AUDITED_READS: Array<[pattern: RegExp, entity: string]> = [
  [/^\/visits\/(\d+)\/images$/, 'visit'],
  [/^\/studies\/(\d+)\/round-film-candidates$/, 'study'],
  [/^\/images\/(\d+)\/files\/[a-z-]+$/, 'image'],
  [/^\/images\/(\d+)\/readings$/, 'image'],
  [/^\/readings\/(\d+)$/, 'reading'],
  [/^\/readings$/, 'reading'],
  [/^\/patients\/(\d+)\/plan$/, 'plan'],
]

function auditedRead(req: Request): { entity: string; entityId: string | null } | null {
  for (const [pattern, entity] of AUDITED_READS) {
    const match = pattern.exec(req.path)
    if (match) return { entity, entityId: match[1] ?? null }
  }
  // Measurement exports are audited by their service with the filter and row count.
  if (/^\/exports\/measurements\./.test(req.path)) return null
  if (req.user?.role === 'researcher') {
    const [, entity = 'api', id] = /^\/([a-z-]+)(?:\/(\d+))?/.exec(req.path) ?? []
    return { entity: entity.slice(0, 40), entityId: id ?? null }
  }
  return null
}

/**
 * Writes one 'view' event per audited read request (never one per row) before the route runs,
 * so the record exists whether the read then succeeds or is refused. The service's own 'view'
 * event for the same request (a researcher opening a patient) is then left out: one event per
 * request. Mounted after `authenticate`.
 */
export function auditReads(db: Db): RequestHandler {
  return async (req, _res, next) => {
    const subject = req.method === 'GET' && req.user ? auditedRead(req) : null
    if (!subject || !req.user) {
      next()
      return
    }
    const researcher = req.user.role === 'researcher'
    await insertAuditEvent(db, {
      userId: req.user.id,
      action: 'view',
      entity: subject.entity,
      entityId: subject.entityId,
      summary: `Requested ${req.baseUrl}${req.path}${researcher ? ' (researcher)' : ''}`,
      ip: req.ip ?? null,
    })
    req.readAudited = { recorded: true }
    next()
  }
}

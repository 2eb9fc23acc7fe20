import { createHash } from 'node:crypto'
import type { Db } from './knex'
import { TABLES } from './tables'

/** The previous hash of the first event: 64 zeros. */
export const GENESIS_HASH = '0'.repeat(64)

/** The fields of an audit event that the chain vouches for, in their stored form. */
export interface ChainedFields {
  id: number
  at: Date
  userId: number | null
  action: string
  entity: string
  entityId: string | null
  summary: string
  ip: string | null
}

/**
 * The event's canonical content: a JSON array in a fixed order, the time as ISO 8601 UTC with
 * milliseconds (the column's precision), so the same row always gives the same bytes.
 */
export function canonicalAuditContent(event: ChainedFields): string {
  return JSON.stringify([
    event.id,
    event.at.toISOString(),
    event.userId,
    event.action,
    event.entity,
    event.entityId,
    event.summary,
    event.ip,
  ])
}

/** SHA-256 (FIPS 180-4) over the previous hash, a newline and the canonical content, as hex. */
export function chainHash(previousHash: string, event: ChainedFields): string {
  return createHash('sha256')
    .update(`${previousHash}\n${canonicalAuditContent(event)}`, 'utf8')
    .digest('hex')
}

/** The stored row of an audit event as the chain reads it. */
export function chainedFieldsOf(row: Record<string, unknown>): ChainedFields {
  return {
    id: Number(row.id),
    at: new Date(row.at as Date),
    userId: row.user_id === null ? null : Number(row.user_id),
    action: String(row.action),
    entity: String(row.entity),
    entityId: row.entity_id === null ? null : String(row.entity_id),
    summary: String(row.summary),
    ip: row.ip === null ? null : String(row.ip),
  }
}

export type ChainBreak =
  | { id: number; reason: 'content-changed' }
  | { id: number; reason: 'link-broken' }
  | { id: number; reason: 'event-missing' }
  | { id: number; reason: 'head-mismatch' }

export interface ChainVerification {
  intact: boolean
  /** Events checked, oldest first. */
  checked: number
  /** The first event where the chain breaks; null when it is intact. */
  firstBreak: ChainBreak | null
}

const BATCH = 1000

/**
 * Recomputes the chain from the first event in batches: an event whose content no longer gives
 * its stored hash was changed; one whose previous hash is not its predecessor's hash, or whose
 * id skips one, marks a deletion or an insertion outside the chain. The head row must name the
 * last event, so deleting the newest events shows too.
 */
export async function verifyAuditChain(db: Db): Promise<ChainVerification> {
  let previousHash = GENESIS_HASH
  let previousId = 0
  let checked = 0
  for (;;) {
    const rows = (await db(TABLES.auditEvents)
      .where('id', '>', previousId)
      .orderBy('id')
      .limit(BATCH)) as Array<Record<string, unknown>>
    for (const row of rows) {
      const fields = chainedFieldsOf(row)
      const fail = (reason: ChainBreak['reason']): ChainVerification => ({
        intact: false,
        checked,
        firstBreak: { id: fields.id, reason } as ChainBreak,
      })
      if (fields.id !== previousId + 1) return fail('event-missing')
      if (row.prev_hash !== previousHash) return fail('link-broken')
      if (chainHash(previousHash, fields) !== row.hash) return fail('content-changed')
      previousHash = String(row.hash)
      previousId = fields.id
      checked += 1
    }
    if (rows.length < BATCH) break
  }
  const head = await db(TABLES.auditChainHead).where({ id: 1 }).first()
  if (head && (Number(head.last_id) !== previousId || head.last_hash !== previousHash))
    return { intact: false, checked, firstBreak: { id: previousId + 1, reason: 'head-mismatch' } }
  return { intact: true, checked, firstBreak: null }
}

import { createHash } from 'node:crypto'

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

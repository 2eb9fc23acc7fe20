import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { chainHash, GENESIS_HASH, type ChainedFields } from './audit-chain'

export interface AuditEntry {
  userId: number | null
  action: string
  entity: string
  entityId: string | number | null
  summary: string
  ip?: string | null
}

/** A lone surrogate would be stored as U+FFFD and then no longer hash alike: replace it first. */
function wellFormed(text: string): string {
  return text.replace(
    /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g,
    '\uFFFD',
  )
}

async function appendChained(trx: Knex.Transaction, entry: AuditEntry): Promise<void> {
  // The head row is locked until this transaction ends: concurrent appends wait in turn, so each
  // links to the one committed before it and the chain never forks.
  const head = (await trx(TABLES.auditChainHead).where({ id: 1 }).forUpdate().first()) as
    { last_id: number | string; last_hash: string } | undefined
  const previousId = head ? Number(head.last_id) : 0
  const previousHash = head?.last_hash ?? GENESIS_HASH
  const fields: ChainedFields = {
    id: previousId + 1,
    at: new Date(),
    userId: entry.userId,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId === null ? null : String(entry.entityId),
    summary: wellFormed(entry.summary.slice(0, 500)),
    ip: entry.ip ?? null,
  }
  const hash = chainHash(previousHash, fields)
  await trx(TABLES.auditEvents).insert({
    id: fields.id,
    at: fields.at,
    user_id: fields.userId,
    action: fields.action,
    entity: fields.entity,
    entity_id: fields.entityId,
    summary: fields.summary,
    ip: fields.ip,
    prev_hash: previousHash,
    hash,
  })
  if (head)
    await trx(TABLES.auditChainHead)
      .where({ id: 1 })
      .update({ last_id: fields.id, last_hash: hash })
  else await trx(TABLES.auditChainHead).insert({ id: 1, last_id: fields.id, last_hash: hash })
}

/**
 * Appends one event to the audit trail, chained by hash to the one before it. Call it inside
 * the transaction of the write it records; a read is recorded in a short transaction of its own.
 */
export async function insertAuditEvent(db: Db, entry: AuditEntry): Promise<void> {
  if (db.isTransaction) await appendChained(db as Knex.Transaction, entry)
  else await db.transaction((trx) => appendChained(trx, entry))
}

export interface AuditEventRecord {
  id: number
  at: string
  userId: number | null
  userName: string | null
  action: string
  entity: string
  entityId: string | null
  summary: string
}

export async function listAuditEvents(
  db: Db,
  filter: { entity?: string; entityId?: string; offset: number; limit: number },
): Promise<{ items: AuditEventRecord[]; total: number }> {
  const base = db(`${TABLES.auditEvents} as a`).leftJoin(
    `${TABLES.users} as u`,
    'u.id',
    'a.user_id',
  )
  if (filter.entity) base.where('a.entity', filter.entity)
  if (filter.entityId) base.where('a.entity_id', filter.entityId)
  const [{ total }] = (await base.clone().count({ total: '*' })) as [{ total: number }]
  const rows = await base
    .select(
      'a.id',
      'a.at',
      'a.user_id',
      'u.display_name',
      'a.action',
      'a.entity',
      'a.entity_id',
      'a.summary',
    )
    .orderBy('a.id', 'desc')
    .offset(filter.offset)
    .limit(filter.limit)
  return {
    total: Number(total),
    items: rows.map((row) => ({
      id: Number(row.id),
      at: new Date(row.at).toISOString(),
      userId: row.user_id,
      userName: row.display_name,
      action: row.action,
      entity: row.entity,
      entityId: row.entity_id,
      summary: row.summary,
    })),
  }
}

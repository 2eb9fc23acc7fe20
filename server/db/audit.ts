import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { batcherPerPool, batchPerTurn } from './turn-batch'

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

type CommitListener = () => void
const commitListeners = new Set<CommitListener>()

/**
 * Calls `listener` whenever an audit event has been committed, so the sealer
 * (server/services/audit-sealer.ts) chains it at once; answers a function that stops the calls.
 */
export function onAuditEventCommitted(listener: CommitListener): () => void {
  commitListeners.add(listener)
  return () => commitListeners.delete(listener)
}

function announceCommitted(): void {
  for (const listener of commitListeners) listener()
}

/** The outermost transaction: an event inside a savepoint is committed with the outer one. */
function outermost(trx: Knex.Transaction): Knex.Transaction {
  let current = trx as Knex.Transaction & { parentTransaction?: Knex.Transaction }
  while (current.parentTransaction) current = current.parentTransaction
  return current
}

/**
 * Appends one event to the audit trail: a single insert, so audited requests never wait for one
 * another. A trigger queues the event and the sealer chains it by hash to the one before it
 * moments later (server/db/audit-seal.ts). Call it inside the transaction of the write it
 * records, so the event and the write commit or fail together.
 */
export async function insertAuditEvent(db: Db, entry: AuditEntry): Promise<void> {
  const row = auditRow(entry)
  if (!db.isTransaction) return auditInserts(db).load(row)
  await db(TABLES.auditEvents).insert(row)
  outermost(db as Knex.Transaction).executionPromise?.then(announceCommitted, () => {})
}

type AuditRow = ReturnType<typeof auditRow>

function auditRow(entry: AuditEntry) {
  return {
    at: new Date(),
    user_id: entry.userId,
    action: entry.action,
    entity: entry.entity,
    entity_id: entry.entityId === null ? null : String(entry.entityId),
    summary: wellFormed(entry.summary.slice(0, 500)),
    ip: entry.ip ?? null,
  }
}

/**
 * Events outside a transaction (the reads audited on arrival, most of all) are written together
 * with the others of the same turn, in one multi-row insert that each of their requests awaits:
 * an event is stored before its request goes on, as it was alone. Should that insert refuse a
 * row, each event is tried alone, so one bad row fails only its own request.
 */
const auditInserts = batcherPerPool((db) =>
  batchPerTurn<AuditRow, void>(async (rows) => {
    try {
      await db(TABLES.auditEvents).insert([...rows])
      announceCommitted()
      return rows.map(() => undefined)
    } catch (error) {
      // A database that does not answer fails every event alike: no second round of waiting.
      if (!isRowError(error)) throw error
      const alone = await Promise.allSettled(rows.map((row) => db(TABLES.auditEvents).insert(row)))
      if (alone.some((result) => result.status === 'fulfilled')) announceCommitted()
      return alone.map((result) =>
        result.status === 'fulfilled' ? undefined : toError(result.reason),
      )
    }
  }),
)

/** SQLSTATE class 22 (data exception) or 23 (integrity constraint): a row's fault, not the link's. */
function isRowError(error: unknown): boolean {
  const state = (error as { sqlState?: unknown } | null)?.sqlState
  return typeof state === 'string' && (state.startsWith('22') || state.startsWith('23'))
}

const toError = (reason: unknown): Error =>
  reason instanceof Error ? reason : new Error(String(reason))

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

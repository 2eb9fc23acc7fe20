import type { Db } from './knex'
import { TABLES } from './tables'

export interface AuditEntry {
  userId: number | null
  action: string
  entity: string
  entityId: string | number | null
  summary: string
  ip?: string | null
}

/** Appends one event to the audit trail. Call it inside the transaction of the write it records. */
export async function insertAuditEvent(db: Db, entry: AuditEntry): Promise<void> {
  await db(TABLES.auditEvents).insert({
    user_id: entry.userId,
    action: entry.action,
    entity: entry.entity,
    entity_id: entry.entityId === null ? null : String(entry.entityId),
    summary: entry.summary.slice(0, 500),
    ip: entry.ip ?? null,
  })
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

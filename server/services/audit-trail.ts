import type { Db } from '../db/knex'
import { listAuditEvents } from '../db/audit'
import type { AuditEvent, Page } from '../../shared/types/api'

/** The audit trail for administrators, newest first. Summaries carry ids and study codes only. */
export async function readAuditTrail(
  db: Db,
  filter: { entity?: string; entityId?: string; offset: number; limit: number },
): Promise<Page<AuditEvent>> {
  return listAuditEvents(db, filter)
}

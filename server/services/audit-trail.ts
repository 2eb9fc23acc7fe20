import type { Db } from '../db/knex'
import { listAuditEvents } from '../db/audit'
import { verifyAuditChain } from '../db/audit-chain-verify'
import type { AuditChainStatus, AuditEvent, Page } from '../../shared/types/api'

/** The audit trail for administrators, newest first. Summaries carry ids and study codes only. */
export async function readAuditTrail(
  db: Db,
  filter: { entity?: string; entityId?: string; offset: number; limit: number },
): Promise<Page<AuditEvent>> {
  return listAuditEvents(db, filter)
}

/** Recomputes the whole chain (server/db/audit-chain.ts); administrators call it on demand. */
export async function checkAuditChain(db: Db): Promise<AuditChainStatus> {
  return verifyAuditChain(db)
}

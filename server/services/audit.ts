import type { Db } from '../db/knex'
import { insertAuditEvent } from '../db/audit'
import type { SessionUser } from '../../shared/types/api'
import { roleCan } from '../../shared/types/permissions'

/** Who is acting and from where: passed from routes into services for the audit trail. */
export interface Actor {
  user: SessionUser
  ip: string | null
  /** Set when the request's read was audited on arrival: a service's own 'view' is then left out. */
  readAudited?: { recorded: boolean }
}

/** Whether the actor may see names, record numbers and dates (else de-identified data only). */
export function actorIdentifies(actor: Actor): boolean {
  return roleCan(actor.user.role, 'patient:identify')
}

export type AuditAction =
  | 'create'
  | 'update'
  | 'delete'
  | 'view'
  | 'sign'
  | 'submit'
  | 'return'
  | 'amend'
  | 'comment'
  | 'invite'
  | 'revoke'
  | 'accept'
  | 'password-reset-requested'
  | 'password-reset'
  | 'mail-resend'
  | 'export'
  | 'login'
  | 'login-failed'
  | 'logout'
  | 'lockout'

export async function audit(
  db: Db,
  actor: Actor | null,
  action: AuditAction,
  entity: string,
  entityId: string | number | null,
  summary: string,
): Promise<void> {
  // The request's read was recorded already (server/middleware/audit-reads.ts).
  if (action === 'view' && actor?.readAudited?.recorded) return
  await insertAuditEvent(db, {
    userId: actor?.user.id ?? null,
    action,
    entity,
    entityId,
    summary,
    ip: actor?.ip ?? null,
  })
}

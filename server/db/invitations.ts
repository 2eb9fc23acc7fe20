import type { Db } from './knex'
import { TABLES } from './tables'
import { toIsoDateTime } from './rows'
import type { Role } from '../../shared/types/domain'
import type { Invitation } from '../../shared/types/accounts'

interface InvitationRow {
  id: number
  email: string
  display_name: string
  role: Role
  invited_by_name: string | null
  expires_at: Date
  created_at: Date
}

function toInvitation(row: InvitationRow): Invitation {
  return {
    id: row.id,
    email: row.email,
    displayName: row.display_name,
    role: row.role,
    invitedByName: row.invited_by_name,
    expiresAt: toIsoDateTime(row.expires_at),
    createdAt: toIsoDateTime(row.created_at),
  }
}

/** Neither accepted, withdrawn nor expired at `now`. */
const pending = (db: Db, now: Date) =>
  db(`${TABLES.invitations} as i`)
    .leftJoin(`${TABLES.users} as u`, 'u.id', 'i.invited_by')
    .whereNull('i.accepted_at')
    .whereNull('i.revoked_at')
    .where('i.expires_at', '>', now)
    .select(
      'i.id',
      'i.email',
      'i.display_name',
      'i.role',
      'u.display_name as invited_by_name',
      'i.expires_at',
      'i.created_at',
    )

export async function listPendingInvitations(db: Db, now: Date): Promise<Invitation[]> {
  const rows = (await pending(db, now).orderBy('i.created_at', 'desc')) as InvitationRow[]
  return rows.map(toInvitation)
}

export async function findPendingInvitationById(
  db: Db,
  id: number,
  now: Date,
): Promise<Invitation | undefined> {
  const row = (await pending(db, now).where('i.id', id).first()) as InvitationRow | undefined
  return row ? toInvitation(row) : undefined
}

/** The pending invitation a link's token hash belongs to; `lock` holds it for an acceptance. */
export async function findPendingInvitationByHash(
  db: Db,
  tokenHash: string,
  now: Date,
  lock = false,
): Promise<Invitation | undefined> {
  const query = pending(db, now).where('i.token_hash', tokenHash)
  if (lock) query.forUpdate()
  const row = (await query.first()) as InvitationRow | undefined
  return row ? toInvitation(row) : undefined
}

export async function insertInvitation(
  db: Db,
  invitation: {
    email: string
    displayName: string
    role: Role
    tokenHash: string
    invitedBy: number
    expiresAt: Date
  },
): Promise<number> {
  const [id] = await db(TABLES.invitations).insert({
    email: invitation.email,
    display_name: invitation.displayName,
    role: invitation.role,
    token_hash: invitation.tokenHash,
    invited_by: invitation.invitedBy,
    expires_at: invitation.expiresAt,
  })
  return id as number
}

/** Withdraws every pending invitation of an address (a new one replaces it). */
export async function revokePendingInvitationsOf(db: Db, email: string, now: Date): Promise<void> {
  await db(TABLES.invitations)
    .where({ email })
    .whereNull('accepted_at')
    .whereNull('revoked_at')
    .update({ revoked_at: now, updated_at: now })
}

export async function revokeInvitation(db: Db, id: number, now: Date): Promise<boolean> {
  const changed = await db(TABLES.invitations)
    .where({ id })
    .whereNull('accepted_at')
    .whereNull('revoked_at')
    .update({ revoked_at: now, updated_at: now })
  return changed === 1
}

export async function markInvitationAccepted(
  db: Db,
  id: number,
  userId: number,
  now: Date,
): Promise<void> {
  await db(TABLES.invitations)
    .where({ id })
    .update({ accepted_at: now, user_id: userId, updated_at: now })
}

import type { Db } from '../db/knex'
import {
  findUserById,
  listActiveUsersWithRole,
  listUsers,
  lockActiveAdminIds,
  updateUser,
  type UserRecord,
} from '../db/users'
import { conflict, notFound } from '../errors'
import type { UserSummary } from '../../shared/types/api'
import type { UserPatch } from '../../shared/types/accounts'
import { audit, type Actor } from './audit'

function toSummary(user: UserRecord): UserSummary {
  return {
    id: user.id,
    email: user.email,
    displayName: user.displayName,
    role: user.role,
    active: user.active,
    lastLoginAt: user.lastLoginAt,
    createdAt: user.createdAt,
  }
}

export async function listUserSummaries(db: Db): Promise<UserSummary[]> {
  return (await listUsers(db)).map(toSummary)
}

/** Active surgeons by name: who can be a patient's responsible surgeon. */
export async function listSurgeons(db: Db): Promise<Array<{ id: number; displayName: string }>> {
  return (await listActiveUsersWithRole(db, 'surgeon')).map((user) => ({
    id: user.id,
    displayName: user.displayName,
  }))
}

/**
 * Role, name and active flag. Deactivating ends the user's sessions at once; the last active
 * administrator can be neither deactivated nor given another role.
 */
export async function patchUser(
  db: Db,
  actor: Actor,
  id: number,
  patch: UserPatch,
): Promise<UserSummary> {
  return db.transaction(async (trx) => {
    const activeAdmins = await lockActiveAdminIds(trx)
    const user = await findUserById(trx, id)
    if (!user) throw notFound('user')
    const losesAdmin =
      user.role === 'admin' &&
      user.active &&
      ((patch.role !== undefined && patch.role !== 'admin') || patch.active === false)
    if (losesAdmin && activeAdmins.length <= 1) {
      throw conflict(
        'Endplate needs at least one active administrator: make another user administrator first.',
        { role: ['role: this is the last active administrator'] },
      )
    }
    const changes: string[] = []
    if (patch.role !== undefined && patch.role !== user.role)
      changes.push(`role ${user.role} → ${patch.role}`)
    if (patch.displayName !== undefined && patch.displayName !== user.displayName)
      changes.push('display name')
    if (patch.active !== undefined && patch.active !== user.active)
      changes.push(patch.active ? 'reactivated' : 'deactivated; sessions ended')
    await updateUser(trx, id, { ...patch, endSessions: patch.active === false && user.active })
    if (changes.length > 0)
      await audit(trx, actor, 'update', 'user', id, `Changed user ${id}: ${changes.join(', ')}`)
    const updated = await findUserById(trx, id)
    if (!updated) throw notFound('user')
    return toSummary(updated)
  })
}

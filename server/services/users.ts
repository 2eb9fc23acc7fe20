import type { Db } from '../db/knex'
import { listUsers } from '../db/users'
import type { UserSummary } from '../../shared/types/api'

export async function listUserSummaries(db: Db): Promise<UserSummary[]> {
  const users = await listUsers(db)
  return users.map((user) => ({
    id: user.id,
    email: user.email,
    displayName: user.displayName,
    role: user.role,
    active: user.active,
    lastLoginAt: user.lastLoginAt,
    createdAt: user.createdAt,
  }))
}

import type { Db } from './knex'
import { TABLES } from './tables'
import { clearSignInFailures, signInAccountKey } from './sign-in-throttle'
import { toBoolean, toIsoDateTime, toIsoDateTimeOrNull } from './rows'
import { batcherPerPool, batchPerTurn } from './turn-batch'
import type { Role } from '../../shared/types/domain'

export interface UserRecord {
  id: number
  email: string
  displayName: string
  role: Role
  active: boolean
  /** Raised to end every session of the user at once (tokens carry the generation they got). */
  sessionGeneration: number
  failedAttempts: number
  lockedUntil: Date | null
  lastLoginAt: string | null
  createdAt: string
}

interface UserRow {
  id: number
  email: string
  display_name: string
  role: Role
  active: number
  session_generation: number
  failed_attempts: number
  locked_until: Date | null
  last_login_at: Date | null
  created_at: Date
}

const COLUMNS = [
  'id',
  'email',
  'display_name',
  'role',
  'active',
  'session_generation',
  'failed_attempts',
  'locked_until',
  'last_login_at',
  'created_at',
]

function toUser(row: UserRow): UserRecord {
  return {
    id: row.id,
    email: row.email,
    displayName: row.display_name,
    role: row.role,
    active: toBoolean(row.active),
    sessionGeneration: row.session_generation,
    failedAttempts: row.failed_attempts,
    lockedUntil: row.locked_until,
    lastLoginAt: toIsoDateTimeOrNull(row.last_login_at),
    createdAt: toIsoDateTime(row.created_at),
  }
}

export interface SessionAccount {
  user: UserRecord
  sessionRevoked: boolean
}

interface SessionKey {
  userId: number
  sessionId: string
}

/**
 * The accounts that session tokens name, and whether each session was signed out, in one
 * statement for every session checked in the same turn: every authenticated request asks, and
 * under load the requests of a turn (often one user's page asking several things at once) then
 * share one round trip. Each answer is read after its request arrived.
 */
async function findSessionAccounts(
  db: Db,
  keys: readonly SessionKey[],
): Promise<Array<SessionAccount | undefined>> {
  const distinct = [...new Map(keys.map((key) => [`${key.userId} ${key.sessionId}`, key])).values()]
  const asked = distinct
    .map(() => 'SELECT ? AS n, ? AS user_id, ? AS session_id')
    .join(' UNION ALL ')
  const [rows] = (await db.raw(
    `SELECT k.n, ${COLUMNS.map((column) => `u.${column}`).join(', ')},
       EXISTS (SELECT 1 FROM ?? r WHERE r.session_id = k.session_id) AS session_revoked
     FROM (${asked}) AS k JOIN ?? u ON u.id = k.user_id`,
    [
      TABLES.revokedSessions,
      ...distinct.flatMap((key, n) => [n, key.userId, key.sessionId]),
      TABLES.users,
    ],
  )) as [Array<UserRow & { n: number; session_revoked: number }>]
  const found = new Map<string, SessionAccount>()
  for (const row of rows) {
    const key = distinct[Number(row.n)] as SessionKey
    found.set(`${key.userId} ${key.sessionId}`, {
      user: toUser(row),
      sessionRevoked: toBoolean(row.session_revoked),
    })
  }
  return keys.map((key) => found.get(`${key.userId} ${key.sessionId}`))
}

const sessionChecks = batcherPerPool((db) =>
  batchPerTurn<SessionKey, SessionAccount | undefined>((keys) => findSessionAccounts(db, keys)),
)

/** The account a session token names, and whether that session was signed out. */
export async function findSessionAccount(
  db: Db,
  userId: number,
  sessionId: string,
): Promise<SessionAccount | undefined> {
  if (!Number.isSafeInteger(userId)) return undefined
  return sessionChecks(db).load({ userId, sessionId })
}

export async function findUserById(db: Db, id: number): Promise<UserRecord | undefined> {
  if (!Number.isSafeInteger(id)) return undefined
  const row = (await db(TABLES.users).select(COLUMNS).where({ id }).first()) as UserRow | undefined
  return row ? toUser(row) : undefined
}

/** The account with its password hash, for sign-in only. */
export async function findUserForLogin(
  db: Db,
  email: string,
): Promise<(UserRecord & { passwordHash: string }) | undefined> {
  const row = (await db(TABLES.users)
    .select([...COLUMNS, 'password_hash'])
    .where({ email: email.toLowerCase() })
    .first()) as (UserRow & { password_hash: string }) | undefined
  return row ? { ...toUser(row), passwordHash: row.password_hash } : undefined
}

/** A stronger hash of the same password (a cost upgrade at sign-in); sessions stay. */
export async function updatePasswordHash(db: Db, id: number, passwordHash: string): Promise<void> {
  await db(TABLES.users)
    .where({ id })
    .update({ password_hash: passwordHash, updated_at: new Date() })
}

export async function recordSuccessfulLogin(db: Db, id: number): Promise<void> {
  await db(TABLES.users).where({ id }).update({
    failed_attempts: 0,
    locked_until: null,
    last_login_at: new Date(),
    updated_at: new Date(),
  })
}

export interface NewUser {
  email: string
  displayName: string
  role: Role
  passwordHash: string
}

export async function insertUser(db: Db, user: NewUser): Promise<number> {
  const [id] = await db(TABLES.users).insert({
    email: user.email.toLowerCase(),
    display_name: user.displayName,
    role: user.role,
    password_hash: user.passwordHash,
  })
  return id as number
}

export async function listUsers(db: Db): Promise<UserRecord[]> {
  const rows = (await db(TABLES.users).select(COLUMNS).orderBy('display_name')) as UserRow[]
  return rows.map(toUser)
}

export async function findUserByEmail(db: Db, email: string): Promise<UserRecord | undefined> {
  const row = (await db(TABLES.users)
    .select(COLUMNS)
    .where({ email: email.trim().toLowerCase() })
    .first()) as UserRow | undefined
  return row ? toUser(row) : undefined
}

/** Active accounts of a role, by name: who a submission goes to when a patient has no surgeon. */
export async function listActiveUsersWithRole(db: Db, role: Role): Promise<UserRecord[]> {
  const rows = (await db(TABLES.users)
    .select(COLUMNS)
    .where({ role, active: true })
    .orderBy('display_name')) as UserRow[]
  return rows.map(toUser)
}

export async function findUsersByIds(db: Db, ids: readonly number[]): Promise<UserRecord[]> {
  if (ids.length === 0) return []
  const rows = (await db(TABLES.users).select(COLUMNS).whereIn('id', ids)) as UserRow[]
  return rows.map(toUser)
}

export interface UserUpdate {
  role?: Role
  active?: boolean
  displayName?: string
  passwordHash?: string
  /** Ends every session the user has open. */
  endSessions?: boolean
}

export async function updateUser(db: Db, id: number, update: UserUpdate): Promise<void> {
  const columns: Record<string, unknown> = { updated_at: new Date() }
  if (update.role !== undefined) columns.role = update.role
  if (update.active !== undefined) columns.active = update.active
  if (update.displayName !== undefined) columns.display_name = update.displayName
  if (update.passwordHash !== undefined) {
    columns.password_hash = update.passwordHash
    // A new password also lifts a running sign-in pause for the account's address.
    const row = (await db(TABLES.users).where({ id }).first('email')) as
      { email: string } | undefined
    if (row) await clearSignInFailures(db, signInAccountKey(row.email))
  }
  if (update.endSessions) columns.session_generation = db.raw('session_generation + 1')
  await db(TABLES.users).where({ id }).update(columns)
}

/** Active administrators, locked for the rest of the transaction (the last one must stay). */
export async function lockActiveAdminIds(db: Db): Promise<number[]> {
  const rows = (await db(TABLES.users)
    .select('id')
    .where({ role: 'admin', active: true })
    .forUpdate()) as Array<{ id: number }>
  return rows.map((row) => row.id)
}

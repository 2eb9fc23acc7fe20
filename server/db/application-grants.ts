import type { Knex } from 'knex'
import { TABLES } from './tables'

/**
 * Tables the application account may read and append to but never change: MariaDB itself then
 * refuses an UPDATE or DELETE of an audit event from the API, whatever a bug or an intruder in
 * the application tries.
 */
const APPEND_ONLY_TABLES: readonly string[] = [TABLES.auditEvents, TABLES.auditSeals]
/**
 * The queue of events awaiting their seal: filled by a trigger (which runs with the schema
 * owner's rights), emptied by the sealer.
 */
const QUEUE_TABLES: readonly string[] = [TABLES.auditUnsealed]
/**
 * Knex's own bookkeeping (the health probe reads it; only the owner migrates), and the patient
 * total, which only the triggers on patients change.
 */
const READ_ONLY_TABLES: readonly string[] = [
  'knex_migrations',
  'knex_migrations_lock',
  TABLES.patientTotal,
]

const ROW_RIGHTS = ['SELECT', 'INSERT', 'UPDATE', 'DELETE'] as const

function rightsFor(table: string): readonly string[] {
  if (APPEND_ONLY_TABLES.includes(table)) return ['SELECT', 'INSERT']
  if (QUEUE_TABLES.includes(table)) return ['SELECT', 'DELETE']
  if (READ_ONLY_TABLES.includes(table)) return ['SELECT']
  return ROW_RIGHTS
}

const quoteName = (name: string) => `\`${name.replace(/`/g, '``')}\``

/**
 * Grants the application account its rights on every table of the owner's current database,
 * table by table, and takes back any right beyond them (an audit table granted in full by an
 * earlier set-up). Run by the schema owner after migrating; idempotent.
 */
export async function grantApplicationAccess(owner: Knex, applicationUser: string): Promise<void> {
  const [selected] = (await owner.raw('SELECT DATABASE() AS name')) as [Array<{ name: string }>]
  const database = selected[0]?.name
  if (!database) throw new Error('grantApplicationAccess needs a connection to one database')
  const tables = (await owner('information_schema.TABLES')
    .where({ TABLE_SCHEMA: database, TABLE_TYPE: 'BASE TABLE' })
    .pluck('TABLE_NAME')) as string[]
  const account = `'${applicationUser.replace(/'/g, "''")}'@'127.0.0.1'`
  const granted = (await owner('information_schema.TABLE_PRIVILEGES')
    .where({ TABLE_SCHEMA: database, GRANTEE: account })
    .select({ table: 'TABLE_NAME', right: 'PRIVILEGE_TYPE' })) as Array<{
    table: string
    right: string
  }>
  for (const table of tables) {
    const wanted = rightsFor(table)
    const target = `${quoteName(database)}.${quoteName(table)}`
    await owner.raw(`GRANT ${wanted.join(', ')} ON ${target} TO ${account}`)
    const extra = granted
      .filter((row) => row.table === table && !wanted.includes(row.right))
      .map((row) => row.right)
    if (extra.length > 0) await owner.raw(`REVOKE ${extra.join(', ')} ON ${target} FROM ${account}`)
  }
}

import type { Db } from '../../../server/db/knex'

/**
 * Tables a refused request may legitimately write:
 * - audit_events: refusals of protected actions are themselves audited (who tried what).
 * - audit_unsealed, audit_seals and audit_chain_head: the queue and the hash chain behind those
 *   events, which follow every audited refusal.
 * - sign_in_throttle and rate_limits: a refused sign-in or reset request is counted, which is
 *   how the throttle and the shared rate limits work.
 * - knex_migrations and its lock: bookkeeping of the migrator, never written by a request.
 */
const MAY_CHANGE_ON_REFUSAL = new Set([
  'audit_events',
  'audit_unsealed',
  'audit_seals',
  'audit_chain_head',
  'sign_in_throttle',
  'rate_limits',
  'knex_migrations',
  'knex_migrations_lock',
])

export type Fingerprint = Record<string, string>

export async function tablesToWatch(db: Db): Promise<string[]> {
  const [rows] = (await db.raw('SHOW TABLES')) as [Record<string, string>[]]
  return rows
    .map((row) => Object.values(row)[0] as string)
    .filter((t) => !MAY_CHANGE_ON_REFUSAL.has(t))
}

/** Row count and `CHECKSUM TABLE` of each watched table. */
export async function fingerprint(db: Db, tables: string[]): Promise<Fingerprint> {
  const [sums] = (await db.raw(`CHECKSUM TABLE ${tables.map((t) => `\`${t}\``).join(', ')}`)) as [
    { Table: string; Checksum: number | null }[],
  ]
  const [counts] = (await db.raw(
    tables.map((t) => `SELECT '${t}' AS t, COUNT(*) AS n FROM \`${t}\``).join(' UNION ALL '),
  )) as [{ t: string; n: number }[]]
  const out: Fingerprint = {}
  for (const row of counts) out[row.t] = `rows ${row.n}`
  for (const row of sums) {
    const table = row.Table.split('.').pop() as string
    out[table] = `${out[table]}, checksum ${row.Checksum}`
  }
  return out
}

export function changedTables(before: Fingerprint, after: Fingerprint): string[] {
  return Object.keys(before).filter((table) => before[table] !== after[table])
}

import type { Db } from './knex'
import { TABLES } from './tables'

export interface StoredSiteSettings {
  values: Record<string, unknown>
  /** The sum of every row's save count: it grows with each save. */
  version: number
  updatedAt: Date | null
  updatedByName: string | null
}

/** Every stored setting; `lock` holds the rows until the transaction ends (a save in progress). */
export async function readSiteSettings(db: Db, lock = false): Promise<StoredSiteSettings> {
  const query = db(`${TABLES.siteSettings} as s`)
    .leftJoin(`${TABLES.users} as u`, 'u.id', 's.updated_by')
    .select(
      's.key',
      // As text, parsed once here: the driver may or may not have parsed a JSON column itself,
      // which makes a stored string ambiguous.
      db.raw('CAST(s.value AS CHAR) AS value_text'),
      's.version',
      's.updated_at',
      'u.display_name',
    )
    .orderBy('s.updated_at', 'desc')
  if (lock) query.forUpdate()
  const rows = (await query) as Array<{
    key: string
    value_text: string
    version: number
    updated_at: Date
    display_name: string | null
  }>
  const values: Record<string, unknown> = {}
  for (const row of rows) values[row.key] = JSON.parse(row.value_text) as unknown
  const latest = rows[0]
  return {
    values,
    version: rows.reduce((sum, row) => sum + row.version, 0),
    updatedAt: latest?.updated_at ?? null,
    updatedByName: latest?.display_name ?? null,
  }
}

/**
 * Writes one setting, counting the save. A first save inserts: when two first saves race, the
 * second meets the primary key and fails (a 409), rather than overwriting unseen.
 */
export async function saveSiteSetting(
  db: Db,
  key: string,
  value: unknown,
  userId: number,
  exists: boolean,
): Promise<void> {
  const now = new Date()
  if (!exists) {
    await db(TABLES.siteSettings).insert({
      key,
      value: JSON.stringify(value),
      version: 1,
      updated_by: userId,
      updated_at: now,
    })
    return
  }
  await db(TABLES.siteSettings)
    .where({ key })
    .update({
      value: JSON.stringify(value),
      version: db.raw('version + 1'),
      updated_by: userId,
      updated_at: now,
    })
}

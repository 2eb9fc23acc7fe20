import type { Db } from './knex'
import { TABLES } from './tables'

/** The stored JSON value of one site setting, or undefined when the site has not set it. */
export async function findSiteSetting(db: Db, key: string): Promise<unknown> {
  const row = (await db(TABLES.siteSettings).select('value').where({ key }).first()) as
    { value: unknown } | undefined
  if (row === undefined) return undefined
  return typeof row.value === 'string' ? JSON.parse(row.value) : row.value
}

import knexFactory from 'knex'
import { config } from '../../server/config'
import { createDb, type Db } from '../../server/db/knex'
import { TABLES_CHILDREN_FIRST } from '../../server/db/tables'

/**
 * Each vitest worker gets a database of its own (endplate_test_w1, _w2, ...) so files running in
 * parallel never truncate each other's rows. Within a worker, files run one after another.
 * ENDPLATE_TEST_DB_TAG keeps two vitest runs on one machine (two checkouts, say) apart.
 */
export function workerDatabaseName(): string {
  const tag = process.env.ENDPLATE_TEST_DB_TAG?.replace(/[^a-z0-9]/gi, '').toLowerCase()
  return `${config.DB_TEST_NAME}_w${process.env.VITEST_POOL_ID ?? '0'}${tag ? `_${tag}` : ''}`
}

/** Creates (when missing) and migrates the worker's database, and opens a pool on it. */
export async function openTestDb(): Promise<Db> {
  const name = workerDatabaseName()
  const admin = knexFactory({
    client: 'mysql2',
    connection: {
      host: config.DB_HOST,
      port: config.DB_PORT,
      user: config.DB_USER,
      password: config.DB_PASSWORD,
    },
  })
  try {
    await admin.raw(
      `CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
    )
  } finally {
    await admin.destroy()
  }
  const db = createDb(name)
  await db.migrate.latest()
  return db
}

/** Empties every table, children first, so each test starts from nothing. */
export async function truncateAll(db: Db): Promise<void> {
  await db.raw('SET FOREIGN_KEY_CHECKS = 0')
  try {
    for (const table of TABLES_CHILDREN_FIRST) await db.raw(`TRUNCATE TABLE \`${table}\``)
  } finally {
    await db.raw('SET FOREIGN_KEY_CHECKS = 1')
  }
}

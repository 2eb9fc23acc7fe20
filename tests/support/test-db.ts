import { config } from '../../server/config'
import { createDb, type Db } from '../../server/db/knex'
import {
  dropAllTables,
  openMigratedDatabase,
  truncateAllTables,
} from '../../server/cli/database-lifecycle'

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
  return openMigratedDatabase(config, workerDatabaseName())
}

/** Empties every table, children first, so each test starts from nothing. */
export const truncateAll = truncateAllTables

/**
 * Runs the demo seed on the pool's database as the schema owner: the seed empties every table
 * first, the audit trail included, which the application account may not.
 */
export async function seedDemo(db: Db): Promise<void> {
  const { database } = db.client.config.connection as { database: string }
  const owner = createDb(database, { timeouts: null, account: 'owner' })
  try {
    await owner.seed.run()
  } finally {
    await owner.destroy()
  }
}

/**
 * A database of the worker's own for tests of the schema itself (migrations up and down, a
 * reset): created when missing, emptied of every table a stopped run left, migrated afresh, and
 * opened as the schema owner, who alone may alter and drop tables.
 */
export async function openScratchSchemaDatabase(suffix: string): Promise<Db> {
  const name = `${workerDatabaseName()}_${suffix}`
  await (await openMigratedDatabase(config, name)).destroy()
  const db = createDb(name, { timeouts: null, account: 'owner' })
  await dropAllTables(db)
  await db.migrate.latest()
  return db
}

/** Drops a database opened by openScratchSchemaDatabase and closes its pool. */
export async function dropScratchSchemaDatabase(db: Db): Promise<void> {
  const { database } = db.client.config.connection as { database: string }
  await db.raw(`DROP DATABASE IF EXISTS \`${database}\``)
  await db.destroy()
}

import knexFactory from 'knex'
import type { AppConfig } from '../config'
import { createDb, type Db } from '../db/knex'
import { TABLES, TABLES_CHILDREN_FIRST } from '../db/tables'
import { GENESIS_HASH } from '../db/audit-chain'
import { grantApplicationAccess } from '../db/application-grants'
import { config as appConfig } from '../config'
import {
  databaseAccounts,
  ensureDatabases,
  mariaDbPaths,
  startMariaDb,
  stopMariaDb,
} from './mariadb'

export interface RunningDatabase {
  /** Stops MariaDB when this process started it; leaves a reused server running. */
  release(): Promise<void>
}

/** Starts (or reuses) the project's MariaDB and makes sure the given databases and accounts exist. */
export async function bringUpDatabase(
  config: AppConfig,
  databases: string[],
): Promise<RunningDatabase> {
  const paths = mariaDbPaths(config.dataDirAbsolute)
  const startedHere = await startMariaDb(paths, config.DB_PORT)
  console.log(
    startedHere
      ? `MariaDB started on 127.0.0.1:${config.DB_PORT} (data in ${config.DB_DATA_DIR}).`
      : `Reusing the MariaDB already running on 127.0.0.1:${config.DB_PORT}.`,
  )
  await ensureDatabases(paths, databases, databaseAccounts(config))
  return {
    async release() {
      if (!startedHere) return
      await stopMariaDb(paths)
      console.log('MariaDB stopped.')
    },
  }
}

/**
 * Runs every pending migration on one database (as the schema owner), then grants the
 * application account its rights on every table, those of new migrations included.
 */
export async function migrateLatest(db: Db): Promise<void> {
  const [, applied] = (await db.migrate.latest()) as [number, string[]]
  if (applied.length > 0) console.log(`Applied ${applied.length} migration(s).`)
  await grantApplicationAccess(db, appConfig.DB_USER)
}

/** Opens a database as the schema owner, runs a function, and always closes the pool. */
export async function withDb<T>(database: string, work: (db: Db) => Promise<T>): Promise<T> {
  // Maintenance (migrations, seeds): no statement timeout, a migration may run long.
  const db = createDb(database, { timeouts: null, account: 'owner' })
  try {
    return await work(db)
  } finally {
    await db.destroy()
  }
}

/**
 * Creates a database of the project's MariaDB when missing (utf8mb4_unicode_ci), migrates it
 * and opens a pool on it: the scratch databases of tests and benchmarks.
 */
export async function openMigratedDatabase(config: AppConfig, name: string): Promise<Db> {
  const admin = knexFactory({
    client: 'mysql2',
    connection: {
      host: config.DB_HOST,
      port: config.DB_PORT,
      user: config.DB_OWNER_USER,
      password: config.DB_OWNER_PASSWORD,
    },
  })
  try {
    await admin.raw(
      `CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
    )
  } finally {
    await admin.destroy()
  }
  const maintenance = createDb(name, { timeouts: null, account: 'owner' })
  try {
    await maintenance.migrate.latest()
    await grantApplicationAccess(maintenance, config.DB_USER)
  } finally {
    await maintenance.destroy()
  }
  return createDb(name)
}

/**
 * Empties every table, children first: a scratch database back to nothing. The application
 * account may not empty the audit trail, so this connects as the schema owner to the database
 * of the given pool.
 */
export async function truncateAllTables(db: Db): Promise<void> {
  const { database, port } = db.client.config.connection as { database: string; port: number }
  const owner = createDb(database, { timeouts: null, account: 'owner', port })
  try {
    await owner.transaction(async (trx) => {
      await trx.raw('SET FOREIGN_KEY_CHECKS = 0')
      try {
        for (const table of TABLES_CHILDREN_FIRST) await trx.raw(`TRUNCATE TABLE \`${table}\``)
        await trx(TABLES.auditChainHead).insert({ id: 1, last_seq: 0, last_hash: GENESIS_HASH })
        // TRUNCATE fires no trigger: the patient total starts again with the empty table.
        await trx(TABLES.patientTotal).insert({ id: 1, total: 0 })
      } finally {
        await trx.raw('SET FOREIGN_KEY_CHECKS = 1')
      }
    })
  } finally {
    await owner.destroy()
  }
}

/**
 * Drops every table of the database the pool is on, migration bookkeeping included, so the next
 * migrate builds the schema from nothing. Rolling the migrations back instead would stop at the
 * first one whose `down` refuses to lose data (the implant-centring template refuses while such
 * readings exist, and the demo always has one). One connection, so foreign key checks stay off
 * for exactly these statements.
 */
export async function dropAllTables(db: Db): Promise<void> {
  await db.transaction(async (trx) => {
    const [rows] = (await trx.raw(
      'SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE()',
    )) as [Array<{ name: string }>]
    await trx.raw('SET FOREIGN_KEY_CHECKS = 0')
    try {
      for (const { name } of rows) await trx.raw(`DROP TABLE IF EXISTS \`${name}\``)
    } finally {
      await trx.raw('SET FOREIGN_KEY_CHECKS = 1')
    }
  })
}

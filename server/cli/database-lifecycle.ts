import type { AppConfig } from '../config'
import { createDb, type Db } from '../db/knex'
import { ensureDatabases, mariaDbPaths, startMariaDb, stopMariaDb } from './mariadb'

export interface RunningDatabase {
  /** Stops MariaDB when this process started it; leaves a reused server running. */
  release(): Promise<void>
}

/** Starts (or reuses) the project's MariaDB and makes sure the given databases and user exist. */
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
  await ensureDatabases(paths, databases, config.DB_USER, config.DB_PASSWORD)
  return {
    async release() {
      if (!startedHere) return
      await stopMariaDb(paths)
      console.log('MariaDB stopped.')
    },
  }
}

/** Runs every pending migration on one database. */
export async function migrateLatest(db: Db): Promise<void> {
  const [, applied] = (await db.migrate.latest()) as [number, string[]]
  if (applied.length > 0) console.log(`Applied ${applied.length} migration(s).`)
}

/** Opens a database, runs a function, and always closes the pool. */
export async function withDb<T>(database: string, work: (db: Db) => Promise<T>): Promise<T> {
  const db = createDb(database)
  try {
    return await work(db)
  } finally {
    await db.destroy()
  }
}

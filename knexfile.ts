import { fileURLToPath } from 'node:url'
import type { Knex } from 'knex'
import { config } from './server/config'
import { applyQueryTimeout, type DbTimeouts } from './server/db/timeouts'

const here = (relative: string) => fileURLToPath(new URL(relative, import.meta.url))

export interface ConnectionOptions {
  /** Another MariaDB than the project's (a test's private instance). */
  port?: number
  /**
   * The API's timeouts (server/db/timeouts.ts). Null for maintenance (migrations, seeds, the
   * knex command line), whose statements may legitimately run long.
   */
  timeouts?: DbTimeouts | null
  /**
   * Which account connects: the application's (default), or the schema owner's for migrations,
   * seeds and test housekeeping.
   */
  account?: 'application' | 'owner'
}

function connectionFor(database: string, options: ConnectionOptions = {}): Knex.Config {
  const timeouts = options.timeouts ?? null
  return {
    client: 'mysql2',
    // No charset here: it would force utf8mb4_general_ci; the database is created utf8mb4_unicode_ci.
    connection: {
      host: config.DB_HOST,
      port: options.port ?? config.DB_PORT,
      user: options.account === 'owner' ? config.DB_OWNER_USER : config.DB_USER,
      password: options.account === 'owner' ? config.DB_OWNER_PASSWORD : config.DB_PASSWORD,
      database,
      // Keep DATETIME values in UTC end to end.
      timezone: 'Z',
      dateStrings: false,
      ...(timeouts ? { connectTimeout: timeouts.connectMs } : {}),
    },
    pool: {
      min: 0,
      max: 10,
      ...(timeouts
        ? {
            afterCreate: applyQueryTimeout(timeouts),
            createTimeoutMillis: timeouts.connectMs + 1_000,
          }
        : {}),
    },
    ...(timeouts ? { acquireConnectionTimeout: timeouts.acquireMs } : {}),
    migrations: {
      directory: here('./migrations'),
      extension: 'ts',
      loadExtensions: ['.ts'],
      tableName: 'knex_migrations',
    },
    // A failing statement's message carries the SQL with '?' placeholders, never the values
    // bound into it (names, birth dates), so error logs cannot leak them.
    compileSqlOnError: false,
    seeds: { directory: here('./seeds'), extension: 'ts', loadExtensions: ['.ts'] },
  }
}

// The knex command line migrates, so it connects as the schema owner.
const knexConfig: Record<'development' | 'test' | 'production', Knex.Config> = {
  development: connectionFor(config.DB_NAME, { account: 'owner' }),
  test: connectionFor(config.DB_TEST_NAME, { account: 'owner' }),
  production: connectionFor(config.DB_NAME, { account: 'owner' }),
}

export default knexConfig
export { connectionFor }

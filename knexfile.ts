import { fileURLToPath } from 'node:url'
import type { Knex } from 'knex'
import { config } from './server/config'

const here = (relative: string) => fileURLToPath(new URL(relative, import.meta.url))

function connectionFor(database: string): Knex.Config {
  return {
    client: 'mysql2',
    // No charset here: it would force utf8mb4_general_ci; the database is created utf8mb4_unicode_ci.
    connection: {
      host: config.DB_HOST,
      port: config.DB_PORT,
      user: config.DB_USER,
      password: config.DB_PASSWORD,
      database,
      // Keep DATETIME values in UTC end to end.
      timezone: 'Z',
      dateStrings: false,
    },
    pool: { min: 0, max: 10 },
    migrations: {
      directory: here('./migrations'),
      extension: 'ts',
      loadExtensions: ['.ts'],
      tableName: 'knex_migrations',
    },
    seeds: { directory: here('./seeds'), extension: 'ts', loadExtensions: ['.ts'] },
  }
}

const knexConfig: Record<'development' | 'test' | 'production', Knex.Config> = {
  development: connectionFor(config.DB_NAME),
  test: connectionFor(config.DB_TEST_NAME),
  production: connectionFor(config.DB_NAME),
}

export default knexConfig
export { connectionFor }

import knexFactory, { type Knex } from 'knex'
import { connectionFor, type ConnectionOptions } from '../../knexfile'
import { config } from '../config'
import { dbTimeouts } from './timeouts'

export type Db = Knex

/**
 * Opens a connection pool to one database of the project's MariaDB, with the API's connect,
 * acquire and query timeouts unless `timeouts: null` asks for a maintenance pool.
 */
export function createDb(database: string, options: ConnectionOptions = {}): Db {
  return knexFactory({
    ...connectionFor(database, {
      ...options,
      timeouts:
        options.timeouts === undefined ? dbTimeouts(config.DB_QUERY_TIMEOUT_MS) : options.timeouts,
    }),
    // Knex prints pool errors to the console; each one also fails its request, which the error
    // handler answers (503 when the database is unreachable) and logs through pino.
    log: { warn() {}, error() {}, deprecate() {}, debug() {} },
  })
}

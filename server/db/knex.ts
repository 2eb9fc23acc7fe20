import knexFactory, { type Knex } from 'knex'
import { connectionFor } from '../../knexfile'

export type Db = Knex

/** Opens a connection pool to one database of the project's MariaDB. */
export function createDb(database: string): Db {
  return knexFactory(connectionFor(database))
}

import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/** Sessions ended by signing out, kept until their token would have expired anyway. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.revokedSessions, (table) => {
    table.string('session_id', 32).primary()
    table.datetime('expires_at', { precision: 3 }).notNullable().index()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.revokedSessions)
}

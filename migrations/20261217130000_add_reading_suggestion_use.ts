import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * For each placed landmark, whether the rater accepted the corner the image suggested (true) or
 * kept their own point beside a suggestion (false); landmarks placed without one are absent.
 * Readers of reliability figures need it to tell assisted placement from placement by eye.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.json('suggestion_use').nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.dropColumn('suggestion_use')
  })
}

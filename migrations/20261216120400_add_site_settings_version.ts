import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/** Each setting counts its saves, so a save based on stale settings answers 409. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.siteSettings, (table) => {
    table.integer('version').unsigned().notNullable().defaultTo(1)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.siteSettings, (table) => {
    table.dropColumn('version')
  })
}

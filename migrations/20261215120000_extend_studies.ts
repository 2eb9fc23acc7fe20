import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * What editing a study needs: a working note beside the one-line description, and a version
 * number so two people editing the same study cannot overwrite each other unseen.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.studies, (table) => {
    table.text('note').nullable()
    table.integer('version').unsigned().notNullable().defaultTo(1)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.studies, (table) => {
    table.dropColumn('version')
    table.dropColumn('note')
  })
}

import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * What a reading needs beyond the first schema: the template's options (segment, construct list)
 * and the spacing of the second film of a motion pair, kept beside the results it produced.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.json('template_options').nullable()
    table.json('paired_calibration').nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.dropColumn('paired_calibration')
    table.dropColumn('template_options')
  })
}

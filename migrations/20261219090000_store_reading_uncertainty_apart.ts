import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * A reading's intervals move out of `results` into a column of their own
 * (server/db/reading-results-columns.ts says why). Existing rows are split in place: the
 * `uncertainty` key's value goes to the new column (SQL NULL where it was JSON null) and is
 * removed from `results`; `down` puts it back. The new column inherits the application
 * account's table rights on readings (granted table by table after every migration).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.json('results_uncertainty').nullable().after('results')
  })
  await knex.raw(
    `UPDATE ?? SET
       results_uncertainty = NULLIF(JSON_EXTRACT(results, '$.uncertainty'), 'null'),
       results = JSON_REMOVE(results, '$.uncertainty')
     WHERE JSON_CONTAINS_PATH(results, 'one', '$.uncertainty')`,
    [TABLES.readings],
  )
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(
    `UPDATE ?? SET results = JSON_SET(results, '$.uncertainty',
       CASE WHEN results_uncertainty IS NULL THEN JSON_EXTRACT('null', '$')
            ELSE JSON_EXTRACT(results_uncertainty, '$') END)`,
    [TABLES.readings],
  )
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.dropColumn('results_uncertainty')
  })
}

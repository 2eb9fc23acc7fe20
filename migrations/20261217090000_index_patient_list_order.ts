import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * The patient list pages by (sort column, id). InnoDB appends the primary key to a secondary
 * index, so an index on the sort column alone serves that order and a page reads only its rows;
 * the existing (family_name, given_name) index does not (the load bench: the first page of 10 000
 * patients sorted 10 000 rows on every request).
 */
const SORT_COLUMNS = ['family_name', 'birth_date', 'updated_at'] as const

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.patients, (table) => {
    for (const column of SORT_COLUMNS) table.index([column], `patients_${column}_order_index`)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.patients, (table) => {
    for (const column of SORT_COLUMNS) table.dropIndex([column], `patients_${column}_order_index`)
  })
}

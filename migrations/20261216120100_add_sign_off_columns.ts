import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { addReference } from '../server/db/schema-helpers'

/**
 * Sign-off: the latest return of a reading (who, when, why), whether a thread entry is a remark
 * or a return, and each patient's responsible surgeon (who is asked to sign).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    addReference(table, 'returned_by', TABLES.users, { nullable: true })
    table.datetime('returned_at', { precision: 3 }).nullable()
    table.text('return_comment').nullable()
    table.index(['rater_id', 'status'])
  })
  await knex.schema.alterTable(TABLES.comments, (table) => {
    table.enum('kind', ['comment', 'return']).notNullable().defaultTo('comment')
  })
  await knex.schema.alterTable(TABLES.patients, (table) => {
    addReference(table, 'responsible_surgeon_id', TABLES.users, {
      nullable: true,
      onDelete: 'SET NULL',
    })
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.patients, (table) => {
    table.dropForeign(['responsible_surgeon_id'])
    table.dropColumn('responsible_surgeon_id')
  })
  await knex.schema.alterTable(TABLES.comments, (table) => {
    table.dropColumn('kind')
  })
  // MariaDB lets the rater foreign key use the composite index; it gets its own one back.
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.dropForeign(['rater_id'])
  })
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.dropIndex(['rater_id', 'status'])
    table.foreign('rater_id').references('id').inTable(TABLES.users).onDelete('RESTRICT')
    table.dropForeign(['returned_by'])
    table.dropColumn('returned_by')
    table.dropColumn('returned_at')
    table.dropColumn('return_comment')
  })
}

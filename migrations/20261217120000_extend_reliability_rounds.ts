import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * What a re-reading round needs beyond the first schema: its kind (between raters or within
 * one), its options (results shown before submit, the gap before a repeat), how many passes each
 * rater makes, the seed its orders and codes were drawn from, and a version for close/reopen.
 * Each rater gets a code (what researchers and the results see instead of a name), and each
 * assignment its own blind code, so that a repeat does not carry the code of the first pass.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.reliabilityRounds, (table) => {
    table.enum('kind', ['inter', 'intra']).notNullable().defaultTo('inter')
    table.json('template_options').nullable()
    table.json('options').nullable()
    table.integer('repeats').unsigned().notNullable().defaultTo(1)
    table.string('seed', 64).notNullable().defaultTo('')
    table.integer('version').unsigned().notNullable().defaultTo(1)
  })
  await knex.schema.alterTable(TABLES.roundRaters, (table) => {
    table.string('rater_code', 8).notNullable().defaultTo('')
  })
  await knex.schema.alterTable(TABLES.roundAssignments, (table) => {
    table.string('blind_code', 16).notNullable().defaultTo('')
  })
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.index(['round_id'], 'readings_round_id')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.dropIndex(['round_id'], 'readings_round_id')
  })
  await knex.schema.alterTable(TABLES.roundAssignments, (table) => {
    table.dropColumn('blind_code')
  })
  await knex.schema.alterTable(TABLES.roundRaters, (table) => {
    table.dropColumn('rater_code')
  })
  await knex.schema.alterTable(TABLES.reliabilityRounds, (table) => {
    table.dropColumn('version')
    table.dropColumn('seed')
    table.dropColumn('repeats')
    table.dropColumn('options')
    table.dropColumn('template_options')
    table.dropColumn('kind')
  })
}

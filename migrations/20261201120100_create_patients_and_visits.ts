import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { addReference, addTimestamps } from '../server/db/schema-helpers'
import { SEXES, VISIT_KINDS } from '../shared/types/domain'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.patients, (table) => {
    table.increments('id').primary()
    table.string('record_number', 40).notNullable().unique()
    table.string('family_name', 100).notNullable()
    table.string('given_name', 100).notNullable()
    table.date('birth_date').notNullable()
    table.enum('sex', [...SEXES]).notNullable()
    // Pseudonym for research use; generated, never derived from identifying data.
    table.string('study_code', 16).notNullable().unique()
    // Recorded bone quality matters to disc replacement candidacy (plan checks).
    table.boolean('osteoporosis').notNullable().defaultTo(false)
    table.text('notes').nullable()
    table.integer('version').unsigned().notNullable().defaultTo(1)
    addReference(table, 'created_by', TABLES.users)
    addTimestamps(knex, table)
    table.index(['family_name', 'given_name'])
  })
  await knex.schema.createTable(TABLES.visits, (table) => {
    table.increments('id').primary()
    addReference(table, 'patient_id', TABLES.patients, { onDelete: 'CASCADE' })
    table.date('visit_date').notNullable()
    table.enum('kind', [...VISIT_KINDS]).notNullable()
    // Follow-ups record the interval since surgery in whole months (e.g. 12 for one year).
    table.integer('months_since_surgery').unsigned().nullable()
    table.string('indication', 500).nullable()
    table.integer('version').unsigned().notNullable().defaultTo(1)
    addReference(table, 'created_by', TABLES.users)
    addTimestamps(knex, table)
    table.index(['patient_id', 'visit_date'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.visits)
  await knex.schema.dropTable(TABLES.patients)
}

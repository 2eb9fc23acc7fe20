import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { addReference, addTimestamps } from '../server/db/schema-helpers'
import { READING_TEMPLATES } from '../shared/types/domain'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.studies, (table) => {
    table.increments('id').primary()
    table.string('name', 160).notNullable().unique()
    table.text('description').nullable()
    addReference(table, 'created_by', TABLES.users)
    addTimestamps(knex, table)
  })
  await knex.schema.createTable(TABLES.studyPatients, (table) => {
    addReference(table, 'study_id', TABLES.studies, { onDelete: 'CASCADE' })
    addReference(table, 'patient_id', TABLES.patients, { onDelete: 'CASCADE' })
    table.primary(['study_id', 'patient_id'])
  })
  await knex.schema.createTable(TABLES.studyMembers, (table) => {
    addReference(table, 'study_id', TABLES.studies, { onDelete: 'CASCADE' })
    addReference(table, 'user_id', TABLES.users, { onDelete: 'CASCADE' })
    table.primary(['study_id', 'user_id'])
  })
  await knex.schema.createTable(TABLES.reliabilityRounds, (table) => {
    table.increments('id').primary()
    addReference(table, 'study_id', TABLES.studies, { onDelete: 'CASCADE' })
    table.string('name', 160).notNullable()
    table.enum('template', [...READING_TEMPLATES]).notNullable()
    table.enum('status', ['open', 'closed']).notNullable().defaultTo('open')
    table.json('results').nullable()
    addReference(table, 'created_by', TABLES.users)
    addTimestamps(knex, table)
  })
  await knex.schema.createTable(TABLES.roundImages, (table) => {
    addReference(table, 'round_id', TABLES.reliabilityRounds, { onDelete: 'CASCADE' })
    addReference(table, 'image_id', TABLES.images, { onDelete: 'RESTRICT' })
    // What raters see instead of anything that identifies the patient or visit.
    table.string('blind_code', 16).notNullable()
    table.primary(['round_id', 'image_id'])
    table.unique(['round_id', 'blind_code'])
  })
  await knex.schema.createTable(TABLES.roundRaters, (table) => {
    addReference(table, 'round_id', TABLES.reliabilityRounds, { onDelete: 'CASCADE' })
    addReference(table, 'user_id', TABLES.users, { onDelete: 'RESTRICT' })
    table.primary(['round_id', 'user_id'])
  })
  await knex.schema.createTable(TABLES.roundAssignments, (table) => {
    table.increments('id').primary()
    addReference(table, 'round_id', TABLES.reliabilityRounds, { onDelete: 'CASCADE' })
    addReference(table, 'image_id', TABLES.images, { onDelete: 'RESTRICT' })
    addReference(table, 'rater_id', TABLES.users, { onDelete: 'RESTRICT' })
    // 1 for the first reading, 2 for a repeat (intra-rater reliability).
    table.integer('repetition').unsigned().notNullable().defaultTo(1)
    table.integer('position').unsigned().notNullable()
    addReference(table, 'reading_id', TABLES.readings, { nullable: true, onDelete: 'SET NULL' })
    table.unique(['round_id', 'image_id', 'rater_id', 'repetition'])
  })
  await knex.schema.createTable(TABLES.auditEvents, (table) => {
    table.bigIncrements('id').primary()
    table.datetime('at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    // Kept when a user is deactivated; null for anonymous events such as a failed sign-in.
    addReference(table, 'user_id', TABLES.users, { nullable: true, onDelete: 'SET NULL' })
    table.string('action', 40).notNullable()
    table.string('entity', 40).notNullable()
    table.string('entity_id', 40).nullable()
    table.string('summary', 500).notNullable()
    table.string('ip', 64).nullable()
    table.index(['entity', 'entity_id'])
    table.index(['at'])
  })
  await knex.schema.createTable(TABLES.mailOutbox, (table) => {
    table.increments('id').primary()
    table.string('to_address', 254).notNullable()
    table.string('subject', 200).notNullable()
    table.text('body_text').notNullable()
    table.enum('status', ['pending', 'sent', 'failed']).notNullable().defaultTo('pending')
    table.string('error', 500).nullable()
    table.integer('attempts').unsigned().notNullable().defaultTo(0)
    table.datetime('sent_at', { precision: 3 }).nullable()
    addTimestamps(knex, table)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.mailOutbox)
  await knex.schema.dropTable(TABLES.auditEvents)
  await knex.schema.dropTable(TABLES.roundAssignments)
  await knex.schema.dropTable(TABLES.roundRaters)
  await knex.schema.dropTable(TABLES.roundImages)
  await knex.schema.dropTable(TABLES.reliabilityRounds)
  await knex.schema.dropTable(TABLES.studyMembers)
  await knex.schema.dropTable(TABLES.studyPatients)
  await knex.schema.dropTable(TABLES.studies)
}

import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { addReference, addTimestamps } from '../server/db/schema-helpers'
import { ROLES } from '../shared/types/domain'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.users, (table) => {
    table.increments('id').primary()
    table.string('email', 254).notNullable().unique()
    table.string('display_name', 120).notNullable()
    table.enum('role', [...ROLES]).notNullable()
    table.string('password_hash', 100).notNullable()
    table.boolean('active').notNullable().defaultTo(true)
    table.integer('failed_attempts').unsigned().notNullable().defaultTo(0)
    table.datetime('locked_until', { precision: 3 }).nullable()
    table.datetime('last_login_at', { precision: 3 }).nullable()
    addTimestamps(knex, table)
  })
  await knex.schema.createTable(TABLES.invitations, (table) => {
    table.increments('id').primary()
    table.string('email', 254).notNullable()
    table.string('display_name', 120).notNullable()
    table.enum('role', [...ROLES]).notNullable()
    table.string('token_hash', 64).notNullable().unique()
    addReference(table, 'invited_by', TABLES.users)
    table.datetime('expires_at', { precision: 3 }).notNullable()
    table.datetime('accepted_at', { precision: 3 }).nullable()
    addTimestamps(knex, table)
  })
  await knex.schema.createTable(TABLES.siteSettings, (table) => {
    table.string('key', 80).primary()
    table.json('value').notNullable()
    addReference(table, 'updated_by', TABLES.users, { nullable: true, onDelete: 'SET NULL' })
    table.datetime('updated_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.siteSettings)
  await knex.schema.dropTable(TABLES.invitations)
  await knex.schema.dropTable(TABLES.users)
}

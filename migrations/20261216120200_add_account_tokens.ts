import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { addReference } from '../server/db/schema-helpers'

/**
 * Accounts: a session generation per user (raised to end every session at once), revocable
 * invitations that remember the account they created, and single-use password reset links.
 * Tokens are kept as SHA-256 hashes only.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.users, (table) => {
    table.integer('session_generation').unsigned().notNullable().defaultTo(0)
  })
  await knex.schema.alterTable(TABLES.invitations, (table) => {
    table.datetime('revoked_at', { precision: 3 }).nullable()
    addReference(table, 'user_id', TABLES.users, { nullable: true, onDelete: 'SET NULL' })
  })
  await knex.schema.createTable(TABLES.passwordResets, (table) => {
    table.increments('id').primary()
    addReference(table, 'user_id', TABLES.users, { onDelete: 'CASCADE' })
    table.string('token_hash', 64).notNullable().unique()
    table.datetime('expires_at', { precision: 3 }).notNullable()
    table.datetime('used_at', { precision: 3 }).nullable()
    table.datetime('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.passwordResets)
  await knex.schema.alterTable(TABLES.invitations, (table) => {
    table.dropForeign(['user_id'])
    table.dropColumn('user_id')
    table.dropColumn('revoked_at')
  })
  await knex.schema.alterTable(TABLES.users, (table) => {
    table.dropColumn('session_generation')
  })
}

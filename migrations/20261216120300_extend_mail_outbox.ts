import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * The outbox's retry schedule and claim (so two sender processes never send one mail twice), the
 * page each mail links to (the sender prefixes PUBLIC_URL), and the local fake server's catches.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.mailOutbox, (table) => {
    table.string('link_path', 300).nullable()
    table.datetime('next_attempt_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
    table.datetime('locked_until', { precision: 3 }).nullable()
    table.index(['status', 'next_attempt_at'])
  })
  await knex.schema.createTable(TABLES.caughtMails, (table) => {
    table.increments('id').primary()
    table.string('to_address', 1000).notNullable()
    table.string('subject', 500).notNullable()
    table.text('body_text', 'mediumtext').notNullable()
    table.datetime('received_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.caughtMails)
  await knex.schema.alterTable(TABLES.mailOutbox, (table) => {
    table.dropIndex(['status', 'next_attempt_at'])
    table.dropColumn('locked_until')
    table.dropColumn('next_attempt_at')
    table.dropColumn('link_path')
  })
}

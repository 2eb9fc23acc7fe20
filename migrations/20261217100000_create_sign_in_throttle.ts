import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * Sign-in protection that several server processes share. `sign_in_throttle` counts failed
 * sign-ins per typed address (hashed, so unknown addresses leave no readable trace) and holds the
 * time before which the next attempt is refused; `rate_limits` is the store of
 * rate-limiter-flexible's MySQL limiter (its documented layout: key, points, expire in ms).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.signInThrottle, (table) => {
    table.string('account_key', 64).primary()
    table.integer('failures').unsigned().notNullable().defaultTo(0)
    table.datetime('next_attempt_at', { precision: 3 }).nullable()
    table.datetime('updated_at', { precision: 3 }).notNullable()
  })
  await knex.schema.createTable(TABLES.rateLimits, (table) => {
    table.string('key', 255).primary()
    table.integer('points').notNullable().defaultTo(0)
    table.bigInteger('expire').unsigned().nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.rateLimits)
  await knex.schema.dropTable(TABLES.signInThrottle)
}

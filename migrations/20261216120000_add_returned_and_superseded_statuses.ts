import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

const enumOf = (values: readonly string[]) => values.map((value) => `'${value}'`).join(', ')

/** A surgeon can return a submitted reading, and an amendment supersedes a signed one. */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    `ALTER TABLE \`${TABLES.readings}\` MODIFY COLUMN \`status\` ENUM(${enumOf([
      'draft',
      'submitted',
      'returned',
      'signed',
      'superseded',
    ])}) NOT NULL DEFAULT 'draft'`,
  )
}

export async function down(knex: Knex): Promise<void> {
  await knex(TABLES.readings).where({ status: 'returned' }).update({ status: 'submitted' })
  await knex(TABLES.readings).where({ status: 'superseded' }).update({ status: 'signed' })
  await knex.raw(
    `ALTER TABLE \`${TABLES.readings}\` MODIFY COLUMN \`status\` ENUM(${enumOf([
      'draft',
      'submitted',
      'signed',
    ])}) NOT NULL DEFAULT 'draft'`,
  )
}

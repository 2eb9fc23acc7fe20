import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { chainedFieldsOf, chainHash, GENESIS_HASH } from '../server/db/audit-chain'
import { grantApplicationAccess } from '../server/db/application-grants'
import { config } from '../server/config'

/**
 * Chains the audit trail by hash and makes it append-only for the application account. Events
 * recorded before this migration are chained here in id order, so an upgraded database starts
 * with one intact chain.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.auditEvents, (table) => {
    table.specificType('prev_hash', 'CHAR(64)').nullable()
    table.specificType('hash', 'CHAR(64)').nullable()
  })
  await knex.schema.createTable(TABLES.auditChainHead, (table) => {
    table.tinyint('id').unsigned().primary()
    table.bigInteger('last_id').unsigned().notNullable()
    table.specificType('last_hash', 'CHAR(64)').notNullable()
  })
  let previousHash = GENESIS_HASH
  let lastId = 0
  const rows = (await knex(TABLES.auditEvents).orderBy('id')) as Array<Record<string, unknown>>
  for (const row of rows) {
    const fields = chainedFieldsOf(row)
    // The chain needs consecutive ids: a gap left by a rolled-back insert is closed by moving
    // the later row down.
    if (fields.id !== lastId + 1) {
      await knex(TABLES.auditEvents)
        .where({ id: fields.id })
        .update({ id: lastId + 1 })
      fields.id = lastId + 1
    }
    const hash = chainHash(previousHash, fields)
    await knex(TABLES.auditEvents)
      .where({ id: fields.id })
      .update({ prev_hash: previousHash, hash })
    previousHash = hash
    lastId = fields.id
  }
  await knex(TABLES.auditChainHead).insert({ id: 1, last_id: lastId, last_hash: previousHash })
  await knex.schema.alterTable(TABLES.auditEvents, (table) => {
    table.specificType('prev_hash', 'CHAR(64)').notNullable().alter()
    table.specificType('hash', 'CHAR(64)').notNullable().alter()
  })
  await grantApplicationAccess(knex, config.DB_USER)
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.auditChainHead)
  await knex.schema.alterTable(TABLES.auditEvents, (table) => {
    table.dropColumn('hash')
    table.dropColumn('prev_hash')
  })
}

import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * Moves the audit trail's hash chain out of the write path. Until now every audited request
 * locked the chain's head row until its transaction committed, so all audited requests of all
 * users ran one after another, each waiting for the previous commit to reach the disk. Now an
 * event is one plain insert; a trigger queues it, and a sealer (server/db/audit-seal.ts) chains
 * the queued events in batches moments later, in the order it finds them committed.
 *
 * The hashes move from audit_events to audit_seals, one row per event, numbered by `seq` (the
 * chain's order). The events chained so far keep their hashes: they were chained in id order
 * with consecutive ids, so an event's seal number is its id.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.auditSeals, (table) => {
    table.bigInteger('seq').unsigned().primary()
    table
      .bigInteger('event_id')
      .unsigned()
      .notNullable()
      .unique()
      .references('id')
      .inTable(TABLES.auditEvents)
    table.specificType('prev_hash', 'CHAR(64)').notNullable()
    table.specificType('hash', 'CHAR(64)').notNullable()
  })
  await knex.raw(
    `INSERT INTO ?? (seq, event_id, prev_hash, hash) SELECT id, id, prev_hash, hash FROM ?? ORDER BY id`,
    [TABLES.auditSeals, TABLES.auditEvents],
  )
  await knex.schema.alterTable(TABLES.auditEvents, (table) => {
    table.dropColumn('prev_hash')
    table.dropColumn('hash')
  })
  await knex.schema.alterTable(TABLES.auditChainHead, (table) => {
    table.renameColumn('last_id', 'last_seq')
  })
  await knex.schema.createTable(TABLES.auditUnsealed, (table) => {
    table.bigInteger('event_id').unsigned().primary()
  })
  // In the database rather than the application, so that no insert (a script's, a seed's, the
  // schema owner's) escapes the queue; the sealer's verification would report one that did.
  await knex.raw(`
    CREATE TRIGGER audit_events_queue_for_seal AFTER INSERT ON \`${TABLES.auditEvents}\`
    FOR EACH ROW INSERT INTO \`${TABLES.auditUnsealed}\` (event_id) VALUES (NEW.id)
  `)
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TRIGGER IF EXISTS audit_events_queue_for_seal')
  await knex.schema.dropTable(TABLES.auditUnsealed)
  await knex.schema.alterTable(TABLES.auditChainHead, (table) => {
    table.renameColumn('last_seq', 'last_id')
  })
  await knex.schema.alterTable(TABLES.auditEvents, (table) => {
    table.specificType('prev_hash', 'CHAR(64)').nullable()
    table.specificType('hash', 'CHAR(64)').nullable()
  })
  await knex.raw(
    `UPDATE ?? e JOIN ?? s ON s.event_id = e.id SET e.prev_hash = s.prev_hash, e.hash = s.hash`,
    [TABLES.auditEvents, TABLES.auditSeals],
  )
  await knex.schema.dropTable(TABLES.auditSeals)
}

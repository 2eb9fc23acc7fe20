import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

// The lists are written out rather than imported: a migration must keep meaning what it meant
// when it was written, whatever the template list becomes later.
const BEFORE = ['slip-grade', 'lumbar-alignment', 'construct-check', 'motion-pair']
const AFTER = [...BEFORE, 'implant-centring']

/** The fifth template, implant centring on a frontal film, for readings and reliability rounds. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.enum('template', AFTER).notNullable().alter()
  })
  await knex.schema.alterTable(TABLES.reliabilityRounds, (table) => {
    table.enum('template', AFTER).notNullable().alter()
  })
}

/** Refuses to run while an implant-centring reading or round exists: it would be lost. */
export async function down(knex: Knex): Promise<void> {
  for (const table of [TABLES.readings, TABLES.reliabilityRounds]) {
    const used = await knex(table).where({ template: 'implant-centring' }).first()
    if (used) throw new Error(`${table} holds implant-centring rows; remove them first`)
  }
  await knex.schema.alterTable(TABLES.reliabilityRounds, (table) => {
    table.enum('template', BEFORE).notNullable().alter()
  })
  await knex.schema.alterTable(TABLES.readings, (table) => {
    table.enum('template', BEFORE).notNullable().alter()
  })
}

import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * Keeps the number of patients in one row, so the whole patient list's first page (the page most
 * often opened) no longer counts every patient's index entry on each request: at 10 000 patients
 * that count was half of the database's work for a list. Triggers keep the row inside the
 * transaction that inserts or deletes a patient, so a reader sees the total of the same snapshot
 * as the rows, exactly as COUNT(*) would; filtered lists (a search, a study, a researcher's
 * patients) still count their matches. TRUNCATE fires no trigger: whatever truncates patients
 * resets the row (server/cli/database-lifecycle.ts).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.patientTotal, (table) => {
    table.tinyint('id').unsigned().primary()
    table.integer('total').unsigned().notNullable()
  })
  await knex.raw(`INSERT INTO ?? (id, total) SELECT 1, COUNT(*) FROM ??`, [
    TABLES.patientTotal,
    TABLES.patients,
  ])
  await knex.raw(`
    CREATE TRIGGER patients_count_insert AFTER INSERT ON \`${TABLES.patients}\`
    FOR EACH ROW UPDATE \`${TABLES.patientTotal}\` SET total = total + 1 WHERE id = 1
  `)
  await knex.raw(`
    CREATE TRIGGER patients_count_delete AFTER DELETE ON \`${TABLES.patients}\`
    FOR EACH ROW UPDATE \`${TABLES.patientTotal}\` SET total = total - 1 WHERE id = 1
  `)
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TRIGGER IF EXISTS patients_count_delete')
  await knex.raw('DROP TRIGGER IF EXISTS patients_count_insert')
  await knex.schema.dropTable(TABLES.patientTotal)
}

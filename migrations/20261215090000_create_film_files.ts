import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'

/**
 * One row per stored film content (the content hash its files are kept under). Uploads, film
 * deletions and the start-up sweep lock this row while they write or remove the shared files,
 * so no image row can lack its files and no file outlives every row that uses it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.filmFiles, (table) => {
    table.string('content_hash', 64).primary()
    table.datetime('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
  })
  await knex.raw(`INSERT INTO ?? (content_hash) SELECT DISTINCT content_hash FROM ??`, [
    TABLES.filmFiles,
    TABLES.images,
  ])
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.filmFiles)
}

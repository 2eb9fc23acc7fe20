import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { BURNED_IN_ANNOTATION_STATES } from '../shared/types/pixel-review'

/**
 * Whether a film's pixels may show identity, and a clinician's review of them. The header's
 * Burned In Annotation (0028,0301) is recorded at ingest; a clinician who has looked at the
 * film may confirm it shows no identity (who and when), and researchers are served only films
 * whose header says NO or that a clinician has confirmed.
 *
 * Existing rows are left 'unknown' rather than read back from their stored originals: that
 * would mean decoding every original (up to UPLOAD_MAX_MB each) from the file store inside the
 * migration, and 'unknown' fails closed (researchers see those films once a clinician has
 * looked at them). New columns inherit the application account's table rights on images
 * (granted table by table after every migration), so no grant changes here.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.images, (table) => {
    table
      .enum('burned_in_annotation', [...BURNED_IN_ANNOTATION_STATES])
      .notNullable()
      .defaultTo('unknown')
    table
      .integer('pixels_cleared_by')
      .unsigned()
      .nullable()
      .references('id')
      .inTable(TABLES.users)
      .onDelete('RESTRICT')
    table.datetime('pixels_cleared_at', { precision: 3 }).nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable(TABLES.images, (table) => {
    table.dropForeign(['pixels_cleared_by'])
  })
  await knex.schema.alterTable(TABLES.images, (table) => {
    table.dropColumn('pixels_cleared_at')
    table.dropColumn('pixels_cleared_by')
    table.dropColumn('burned_in_annotation')
  })
}

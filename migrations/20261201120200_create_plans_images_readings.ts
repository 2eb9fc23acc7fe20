import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { addReference, addTimestamps } from '../server/db/schema-helpers'
import {
  IMAGE_VIEWS,
  MOTION_SEGMENTS,
  PLANNED_TREATMENTS,
  READING_STATUSES,
  READING_TEMPLATES,
  SPACING_SOURCES,
} from '../shared/types/domain'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(TABLES.planSegments, (table) => {
    table.increments('id').primary()
    addReference(table, 'patient_id', TABLES.patients, { onDelete: 'CASCADE' })
    table.enum('segment', [...MOTION_SEGMENTS]).notNullable()
    table.boolean('pars_defect_left').notNullable().defaultTo(false)
    table.boolean('pars_defect_right').notNullable().defaultTo(false)
    table.boolean('facet_degeneration').notNullable().defaultTo(false)
    table.boolean('dynamic_instability').notNullable().defaultTo(false)
    table
      .enum('treatment', [...PLANNED_TREATMENTS])
      .notNullable()
      .defaultTo('none')
    table.decimal('implant_lordosis_deg', 5, 1).nullable()
    table.decimal('implant_height_mm', 5, 1).nullable()
    table.string('notes', 1000).nullable()
    table.integer('version').unsigned().notNullable().defaultTo(1)
    addReference(table, 'updated_by', TABLES.users)
    addTimestamps(knex, table)
    table.unique(['patient_id', 'segment'])
  })
  await knex.schema.createTable(TABLES.images, (table) => {
    table.increments('id').primary()
    addReference(table, 'visit_id', TABLES.visits, { onDelete: 'RESTRICT' })
    table.enum('view', [...IMAGE_VIEWS]).notNullable()
    table.enum('file_kind', ['dicom', 'png', 'jpeg', 'tiff']).notNullable()
    table.string('content_hash', 64).notNullable()
    // Paths are relative to UPLOAD_DIR and built from the hash, never from the client's name.
    table.string('original_path', 200).notNullable()
    table.string('display_path', 200).notNullable()
    table.string('preview_path', 200).notNullable()
    table.string('thumbnail_path', 200).notNullable()
    table.string('full_depth_path', 200).notNullable()
    table.string('original_name', 255).nullable()
    table.bigInteger('size_bytes').unsigned().notNullable()
    table.integer('width').unsigned().notNullable()
    table.integer('height').unsigned().notNullable()
    table.integer('bits_stored').unsigned().notNullable()
    table.double('mm_per_pixel_row').nullable()
    table.double('mm_per_pixel_column').nullable()
    table
      .enum('spacing_source', [...SPACING_SOURCES])
      .notNullable()
      .defaultTo('none')
    table.string('spacing_note', 300).nullable()
    // The manual calibration line and its true length, when one was drawn.
    table.json('manual_calibration').nullable()
    table.double('window_center').nullable()
    table.double('window_width').nullable()
    table.datetime('acquired_at', { precision: 3 }).nullable()
    // DICOM attributes kept from the header (identifying ones are served only to clinicians).
    table.json('dicom_attributes').nullable()
    table.integer('version').unsigned().notNullable().defaultTo(1)
    addReference(table, 'uploaded_by', TABLES.users)
    addTimestamps(knex, table)
    table.unique(['visit_id', 'content_hash'])
  })
  await knex.schema.createTable(TABLES.readings, (table) => {
    table.increments('id').primary()
    addReference(table, 'image_id', TABLES.images, { onDelete: 'RESTRICT' })
    // The second film of a motion pair (flexion on image_id, extension here).
    addReference(table, 'paired_image_id', TABLES.images, { nullable: true, onDelete: 'RESTRICT' })
    addReference(table, 'rater_id', TABLES.users)
    table.enum('template', [...READING_TEMPLATES]).notNullable()
    table.string('segment', 8).nullable()
    table.json('landmarks').notNullable()
    table.json('paired_landmarks').nullable()
    table.json('calibration').nullable()
    // Results are always computed by the server's copy of the engine from the landmarks.
    table.json('results').notNullable()
    table.string('engine_version', 20).notNullable()
    table
      .enum('status', [...READING_STATUSES])
      .notNullable()
      .defaultTo('draft')
    table.integer('version').unsigned().notNullable().defaultTo(1)
    table.boolean('blinded').notNullable().defaultTo(false)
    table.integer('round_id').unsigned().nullable()
    addReference(table, 'supersedes_id', TABLES.readings, { nullable: true, onDelete: 'RESTRICT' })
    table.string('supersede_reason', 500).nullable()
    addReference(table, 'reviewer_id', TABLES.users, { nullable: true })
    table.datetime('submitted_at', { precision: 3 }).nullable()
    addReference(table, 'signed_by', TABLES.users, { nullable: true })
    table.datetime('signed_at', { precision: 3 }).nullable()
    addTimestamps(knex, table)
    table.index(['status', 'reviewer_id'])
  })
  await knex.schema.createTable(TABLES.comments, (table) => {
    table.increments('id').primary()
    addReference(table, 'reading_id', TABLES.readings, { onDelete: 'CASCADE' })
    addReference(table, 'user_id', TABLES.users)
    table.text('body').notNullable()
    table.datetime('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable(TABLES.comments)
  await knex.schema.dropTable(TABLES.readings)
  await knex.schema.dropTable(TABLES.images)
  await knex.schema.dropTable(TABLES.planSegments)
}

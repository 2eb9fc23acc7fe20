import type { Knex } from 'knex'

/** created_at / updated_at in UTC with millisecond precision. updated_at is set by repositories. */
export function addTimestamps(knex: Knex, table: Knex.CreateTableBuilder): void {
  table.datetime('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
  table.datetime('updated_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3))
}

/** An unsigned integer foreign key with an index. */
export function addReference(
  table: Knex.CreateTableBuilder,
  column: string,
  referencedTable: string,
  options: { nullable?: boolean; onDelete?: 'CASCADE' | 'RESTRICT' | 'SET NULL' } = {},
): void {
  const builder = table.integer(column).unsigned()
  if (options.nullable) builder.nullable()
  else builder.notNullable()
  builder
    .references('id')
    .inTable(referencedTable)
    .onDelete(options.onDelete ?? 'RESTRICT')
}

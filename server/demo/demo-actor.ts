import type { Knex } from 'knex'
import { TABLES } from '../db/tables'
import type { Actor } from '../services/audit'

/** A demo user as the services expect the person acting. */
export async function demoActor(knex: Knex, email: string): Promise<Actor> {
  const row = await knex(TABLES.users).where({ email }).first()
  if (!row) throw new Error(`No demo user ${email}`)
  return {
    user: { id: row.id, email: row.email, displayName: row.display_name, role: row.role },
    ip: null,
  }
}

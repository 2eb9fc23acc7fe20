import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Db } from '../../server/db/knex'
import { config } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { dropAllTables } from '../../server/cli/database-lifecycle'
import { createTestUser } from '../support/test-app'
import { insertStudyWith } from '../support/fixtures'
import { dropScratchSchemaDatabase, openScratchSchemaDatabase } from '../support/test-db'

// `npm run db:reset` on a database holding an implant-centring row: the reset must not depend on
// the migrations' `down` steps, one of which refuses to drop a template still in use.
let db: Db

async function tableNames(): Promise<string[]> {
  const [rows] = (await db.raw(
    'SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE()',
  )) as [Array<{ name: string }>]
  return rows.map((row) => row.name)
}

// A run stopped half-way leaves rows behind: the scratch database starts from empty tables.
beforeAll(async () => {
  db = await openScratchSchemaDatabase('reset')
})
afterAll(() => dropScratchSchemaDatabase(db))

describe('dropAllTables (db:reset)', () => {
  it('drops every table although a migration would refuse to roll back, and migrates afresh', async () => {
    const researcher = await createTestUser(db, config, 'researcher')
    const studyId = await insertStudyWith(db, researcher.id, [])
    await db(TABLES.reliabilityRounds).insert({
      study_id: studyId,
      name: 'Frontal round',
      template: 'implant-centring',
      created_by: researcher.id,
    })
    // What db:reset did before: the rollback stops at the implant-centring migration.
    await expect(db.migrate.rollback(undefined, true)).rejects.toThrow(
      /holds implant-centring rows/,
    )

    await dropAllTables(db)
    expect(await tableNames()).toEqual([])
    await db.migrate.latest()
    expect(await tableNames()).toEqual(expect.arrayContaining([TABLES.readings, TABLES.users]))
    expect(await db(TABLES.reliabilityRounds).count({ n: '*' })).toEqual([{ n: 0 }])
  })
})

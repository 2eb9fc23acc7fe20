// The total the whole patient list shows comes from a row kept by triggers (migration
// 20261220090000), not from counting: these checks hold it to COUNT(*) of the same table, the
// definition it replaces, through concurrent creation, deletion and truncation.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertTestPatient } from '../support/fixtures'

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>

beforeAll(async () => {
  db = await openTestDb()
  ;({ app, config } = buildTestApp(db))
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
})

async function countedPatients(): Promise<number> {
  const [{ n }] = (await db(TABLES.patients).count({ n: '*' })) as [{ n: number }]
  return Number(n)
}

async function listedTotal(): Promise<number> {
  const res = await request(app).get('/api/patients?limit=5').set('Cookie', users.surgeon.cookie)
  expect(res.status).toBe(200)
  return res.body.total as number
}

describe('the whole patient list total', () => {
  it('is 0 after truncation and follows patients created at the same time', async () => {
    expect(await listedTotal()).toBe(0)
    const created = await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        request(app)
          .post('/api/patients')
          .set('Cookie', users.fellow.cookie)
          .send({
            recordNumber: `EPT-${String(i).padStart(4, '0')}`,
            familyName: 'Marrowgate',
            givenName: `Ines${i}`,
            birthDate: '1968-04-11',
            sex: 'female',
          }),
      ),
    )
    expect(created.map((res) => res.status)).toEqual(Array(20).fill(201))
    expect(await countedPatients()).toBe(20)
    expect(await listedTotal()).toBe(20)
  })

  it('follows deleted patients, and a failed insert leaves it unchanged', async () => {
    const ids = await Promise.all(
      Array.from({ length: 6 }, () => insertTestPatient(db, users.fellow.id)),
    )
    await db(TABLES.patients).whereIn('id', ids.slice(0, 2)).delete()
    expect(await listedTotal()).toBe(4)
    // A record number already taken: the insert is refused and its trigger's change with it.
    const taken = (await db(TABLES.patients).where({ id: ids[2] }).first()).record_number
    await expect(
      insertTestPatient(db, users.fellow.id, { recordNumber: taken as string }),
    ).rejects.toMatchObject({ code: 'ER_DUP_ENTRY' })
    expect(await countedPatients()).toBe(4)
    expect(await listedTotal()).toBe(4)
  })

  it('a search and a page past the end still count their own matches', async () => {
    await insertTestPatient(db, users.fellow.id, { familyName: 'Ashdown' })
    await insertTestPatient(db, users.fellow.id, { familyName: 'Brackenridge' })
    const search = await request(app)
      .get('/api/patients?q=Ashd')
      .set('Cookie', users.surgeon.cookie)
    expect(search.body.total).toBe(1)
    const past = await request(app)
      .get('/api/patients?offset=10')
      .set('Cookie', users.surgeon.cookie)
    expect(past.body).toMatchObject({ items: [], total: 2 })
  })

  it('cannot be changed by the application account', async () => {
    // MariaDB error 1142 ER_TABLEACCESS_DENIED_ERROR: only the triggers (run as the schema owner)
    // write the row.
    await expect(db(TABLES.patientTotal).update({ total: 99 })).rejects.toMatchObject({
      errno: 1142,
    })
  })
})

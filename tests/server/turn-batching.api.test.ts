// Requests that arrive together share one statement for their session checks and one for their
// audit events (server/db/turn-batch.ts). Sharing must never mix answers up: each request gets
// its own account, its own signed-out or deactivated refusal, and its own event.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { insertAuditEvent } from '../../server/db/audit'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  type TestUser,
} from '../support/test-app'

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

describe('session checks made together', () => {
  it('answer each request with its own account, refusal or renewal', async () => {
    const signedOut = await createTestUser(db, config, 'fellow', 'signed-out@test.example')
    const deactivated = await createTestUser(db, config, 'surgeon', 'deactivated@test.example')
    expect(
      (await request(app).post('/api/auth/logout').set('Cookie', signedOut.cookie)).status,
    ).toBeLessThan(300)
    await db(TABLES.users).where({ id: deactivated.id }).update({ active: false })

    const everyone = [...Object.values(users), signedOut, deactivated]
    // Three rounds of every cookie at once, in an order that interleaves the accounts.
    const asked = [...everyone, ...everyone.slice().reverse(), ...everyone]
    const answers = await Promise.all(
      asked.map((user) => request(app).get('/api/auth/me').set('Cookie', user.cookie)),
    )
    const expected = (user: TestUser) =>
      user === signedOut
        ? { status: 401, message: 'You have signed out. Please sign in again.', id: undefined }
        : user === deactivated
          ? { status: 401, message: 'This account is not active.', id: undefined }
          : { status: 200, message: undefined, id: user.id }
    expect(
      answers.map((res) => ({
        status: res.status,
        message: res.body.error?.message,
        id: res.body.user?.id,
      })),
    ).toEqual(asked.map(expected))
  })
})

describe('audit events written together', () => {
  it('stores every event of the turn, each with its own content', async () => {
    await Promise.all(
      Array.from({ length: 30 }, (_, i) =>
        insertAuditEvent(db, {
          userId: users.fellow.id,
          action: 'view',
          entity: 'patient',
          entityId: i,
          summary: `Viewed patient number ${i}`,
        }),
      ),
    )
    const stored = await db(TABLES.auditEvents).orderBy('id').select('entity_id', 'summary')
    expect(stored).toHaveLength(30)
    expect(new Set(stored.map((row) => row.entity_id))).toEqual(
      new Set(Array.from({ length: 30 }, (_, i) => String(i))),
    )
    for (const row of stored) expect(row.summary).toBe(`Viewed patient number ${row.entity_id}`)
  })

  it('fails only the request whose event cannot be stored', async () => {
    const event = (entity: string, i: number) =>
      insertAuditEvent(db, {
        userId: users.fellow.id,
        action: 'view',
        entity,
        entityId: i,
        summary: `Event ${i}`,
      })
    // entity is VARCHAR(40): in MariaDB's strict mode a longer one is refused (ER_DATA_TOO_LONG).
    const results = await Promise.allSettled([
      event('patient', 1),
      event('x'.repeat(41), 2),
      event('patient', 3),
    ])
    expect(results.map((result) => result.status)).toEqual(['fulfilled', 'rejected', 'fulfilled'])
    expect(await db(TABLES.auditEvents).orderBy('entity_id').pluck('entity_id')).toEqual(['1', '3'])
  })
})

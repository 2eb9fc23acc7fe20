import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import type { Role } from '../../shared/types/domain'
import { APP_VERSION } from '../../server/version'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'

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

describe('GET /api/health', () => {
  it('tells anyone only whether the service and its database are up', async () => {
    const res = await request(app).get('/api/health')
    expect(res.status).toBe(200)
    // No version and no migration counts: they would tell a visitor which build is running.
    expect(res.body).toEqual({ status: 'ok', database: 'up' })
  })

  it('gives a signed-in administrator the version and migration counts', async () => {
    const res = await request(app).get('/api/health/details').set('Cookie', users.admin.cookie)
    expect(res.status).toBe(200)
    const [completed, pending] = (await db.migrate.list()) as [unknown[], unknown[]]
    expect(res.body).toEqual({
      status: 'ok',
      database: 'up',
      migrations: { applied: completed.length, pending: pending.length },
      version: APP_VERSION,
    })
    expect((await request(app).get('/api/health/details')).status).toBe(401)
    const surgeon = await request(app)
      .get('/api/health/details')
      .set('Cookie', users.surgeon.cookie)
    expect(surgeon.status).toBe(403)
  })
})

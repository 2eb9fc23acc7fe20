import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import type { Role } from '../../shared/types/domain'

let db: Db
let app: Express
let users: Record<Role, TestUser>
beforeAll(async () => {
  db = await openTestDb()
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  await truncateAll(db)
  const built = buildTestApp(db)
  app = built.app
  users = await createUsersForEveryRole(db, built.config)
})

// RFC 9111 §5.2.2.5: no-store forbids any cache (browser disk cache included) to keep the answer.
describe('Cache-Control on API answers', () => {
  it('is no-store on lists, on errors and on anonymous answers', async () => {
    const list = await request(app).get('/api/patients').set('Cookie', users.surgeon.cookie)
    expect(list.status).toBe(200)
    expect(list.headers['cache-control']).toBe('no-store')
    const missing = await request(app)
      .get('/api/patients/999999')
      .set('Cookie', users.surgeon.cookie)
    expect(missing.status).toBe(404)
    expect(missing.headers['cache-control']).toBe('no-store')
    const anonymous = await request(app).get('/api/users')
    expect(anonymous.headers['cache-control']).toBe('no-store')
    const unknownRoute = await request(app)
      .get('/api/no-such-thing')
      .set('Cookie', users.surgeon.cookie)
    expect(unknownRoute.headers['cache-control']).toBe('no-store')
  })
})

// W3C Clear-Site-Data §3.1: the "cache" type drops the origin's locally cached responses.
describe('POST /api/auth/logout', () => {
  it('asks the browser to clear its cache for the site', async () => {
    const res = await request(app).post('/api/auth/logout').set('Cookie', users.fellow.cookie)
    expect(res.status).toBe(204)
    expect(res.headers['clear-site-data']).toBe('"cache"')
  })
})

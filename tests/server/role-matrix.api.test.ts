import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'

type Who = Role | 'anonymous'

interface RouteCase {
  method: 'get' | 'post' | 'patch'
  path: (ids: Ids) => string
  body?: (ids: Ids, n: number) => object
  expect: Record<Who, number>
}

interface Ids {
  patientId: number
  visitId: number
  patientVersion: () => Promise<number>
  visitVersion: () => Promise<number>
}

let n = 0
const newPatient = () => {
  n += 1
  return { recordNumber: `MX-${n}`, familyName: 'Matrixson', givenName: 'Ivo', birthDate: '1980-01-01', sex: 'male' }
}

// Expected status for each role on every API route (product roles: admin manages users, audit and
// settings only; surgeon and fellow work with identified patients; researcher sees de-identified data).
const ROUTES: RouteCase[] = [
  { method: 'get', path: () => '/api/health', expect: { anonymous: 200, admin: 200, surgeon: 200, fellow: 200, researcher: 200 } },
  { method: 'get', path: () => '/api/auth/me', expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 200, researcher: 200 } },
  { method: 'post', path: () => '/api/auth/logout', expect: { anonymous: 401, admin: 204, surgeon: 204, fellow: 204, researcher: 204 } },
  { method: 'get', path: () => '/api/patients', expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 } },
  { method: 'post', path: () => '/api/patients', body: () => newPatient(), expect: { anonymous: 401, admin: 403, surgeon: 201, fellow: 201, researcher: 403 } },
  { method: 'get', path: (ids) => `/api/patients/${ids.patientId}`, expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 } },
  { method: 'patch', path: (ids) => `/api/patients/${ids.patientId}`, body: () => ({ notes: 'matrix' }), expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 } },
  { method: 'get', path: (ids) => `/api/patients/${ids.patientId}/visits`, expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 } },
  { method: 'post', path: (ids) => `/api/patients/${ids.patientId}/visits`, body: () => ({ visitDate: '2026-01-05', visitKind: 'pre-op' }), expect: { anonymous: 401, admin: 403, surgeon: 201, fellow: 201, researcher: 403 } },
  { method: 'get', path: (ids) => `/api/visits/${ids.visitId}`, expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 } },
  { method: 'patch', path: (ids) => `/api/visits/${ids.visitId}`, body: () => ({ indication: 'matrix' }), expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 } },
  { method: 'get', path: () => '/api/users', expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 } },
  { method: 'get', path: () => '/api/audit-events', expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 } },
  { method: 'get', path: () => '/api/no-such-route', expect: { anonymous: 401, admin: 404, surgeon: 404, fellow: 404, researcher: 404 } },
]

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let ids: Ids

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
  const patientId = await insertTestPatient(db, users.fellow.id)
  const visitId = await insertTestVisit(db, patientId, users.fellow.id)
  await insertStudyWith(db, users.researcher.id, [patientId])
  ids = {
    patientId,
    visitId,
    patientVersion: async () => (await db('patients').where({ id: patientId }).first()).version,
    visitVersion: async () => (await db('visits').where({ id: visitId }).first()).version,
  }
})

describe('role × route matrix', () => {
  for (const route of ROUTES) {
    it(`${route.method.toUpperCase()} ${route.path({ patientId: 1, visitId: 1 } as Ids).replace(/\/1(\/|$)/g, '/:id$1')} answers each role as designed`, async () => {
      const seen: Record<string, number> = {}
      for (const who of Object.keys(route.expect) as Who[]) {
        let body = route.body?.(ids, n)
        if (route.method === 'patch' && body) {
          body = { ...body, version: route.path(ids).includes('/visits/') ? await ids.visitVersion() : await ids.patientVersion() }
        }
        const call = request(app)[route.method](route.path(ids))
        if (who !== 'anonymous') call.set('Cookie', users[who].cookie)
        const res = body ? await call.send(body) : await call
        seen[who] = res.status
      }
      expect(seen).toEqual(route.expect)
    })
  }

  it('hides a patient outside the researcher\'s studies as if it did not exist', async () => {
    const otherPatient = await insertTestPatient(db, users.fellow.id)
    const res = await request(app).get(`/api/patients/${otherPatient}`).set('Cookie', users.researcher.cookie)
    expect(res.status).toBe(404)
    const list = await request(app).get('/api/patients').set('Cookie', users.researcher.cookie)
    expect(list.body.items.map((p: { id: number }) => p.id)).toEqual([ids.patientId])
  })
})

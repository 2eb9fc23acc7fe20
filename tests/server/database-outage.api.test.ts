import { createServer, type Server } from 'node:http'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Db } from '../../server/db/knex'
import { createDb } from '../../server/db/knex'
import { migrateLatest } from '../../server/cli/database-lifecycle'
import type { AppConfig } from '../../server/config'
import type { Role } from '../../shared/types/domain'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertTestPatient } from '../support/fixtures'
import { startPrivateMariaDb, type PrivateMariaDb } from '../support/private-mariadb'

let mariadb: PrivateMariaDb
let db: Db
let server: Server
let baseUrl: string
let config: AppConfig
let users: Record<Role, TestUser>
let patientId: number

beforeAll(async () => {
  mariadb = await startPrivateMariaDb()
  const maintenance = createDb(mariadb.database, {
    port: mariadb.port,
    timeouts: null,
    account: 'owner',
  })
  await migrateLatest(maintenance)
  await maintenance.destroy()
  db = mariadb.openDb()
  let app
  // A short statement limit keeps the pause short; the production default is in .env.example.
  ;({ app, config } = buildTestApp(db, { DB_QUERY_TIMEOUT_MS: '2000' }))
  users = await createUsersForEveryRole(db, config)
  patientId = await insertTestPatient(db, users.fellow.id)
  server = createServer(app)
  await new Promise<void>((resolveListen) => server.listen(0, '127.0.0.1', () => resolveListen()))
  const address = server.address()
  if (!address || typeof address === 'string') throw new Error('no port')
  baseUrl = `http://127.0.0.1:${address.port}`
}, 120_000)

afterAll(async () => {
  mariadb?.resume()
  server?.closeAllConnections()
  await new Promise<void>((resolveClose) =>
    server ? server.close(() => resolveClose()) : resolveClose(),
  )
  await db?.destroy()
  await mariadb?.remove()
}, 60_000)

/** A mix of what users do at once: lists, a record, a write, and the health probe. */
function load(): Array<Promise<request.Response>> {
  const calls: Array<Promise<request.Response>> = []
  for (let i = 0; i < 6; i++) {
    calls.push(request(baseUrl).get('/api/patients').set('Cookie', users.surgeon.cookie))
    calls.push(
      request(baseUrl).get(`/api/patients/${patientId}`).set('Cookie', users.fellow.cookie),
    )
  }
  for (let i = 0; i < 3; i++) {
    calls.push(
      request(baseUrl)
        .post('/api/patients')
        .set('Cookie', users.fellow.cookie)
        .send({
          recordNumber: `OUT-${Date.now()}-${i}`,
          familyName: 'Ashgrove',
          givenName: 'Perrin',
          birthDate: '1961-04-09',
          sex: 'male',
        }),
    )
  }
  calls.push(request(baseUrl).get('/api/health'))
  return calls
}

function expectUnavailable(res: request.Response): void {
  expect(res.status).toBe(503)
  expect(Number(res.headers['retry-after'])).toBeGreaterThan(0)
  // The health probe answers its own body (HealthStatus); every other route the error body.
  if ('database' in res.body) {
    expect(res.body.database).toBe('down')
  } else {
    expect(res.body.error.code).toBe('database_unavailable')
    expect(res.body.error.message).toMatch(/try again/i)
  }
}

async function waitUntilHealthy(): Promise<request.Response> {
  for (let attempt = 0; attempt < 60; attempt++) {
    const res = await request(baseUrl).get('/api/health')
    if (res.status === 200) return res
    await new Promise((resolveWait) => setTimeout(resolveWait, 250))
  }
  throw new Error('the API did not report the database up again')
}

describe('MariaDB paused (SIGSTOP) under load', () => {
  it('answers every request 503 with Retry-After instead of hanging, and recovers on SIGCONT', async () => {
    // Warm the pool, so the pause catches connections that are open and idle.
    await Promise.all(load())
    mariadb.pause()
    try {
      // Each of these would wait for the whole pause without timeouts; vitest's 30 s test
      // limit turns such a hang into a failure.
      const answers = await Promise.all(load())
      for (const res of answers) expectUnavailable(res)
      // The health probe answers on its own short limit while requests queue on the pool.
      const health = await request(baseUrl).get('/api/health')
      expectUnavailable(health)
    } finally {
      mariadb.resume()
    }
    expect((await waitUntilHealthy()).body.database).toBe('up')
    const after = await Promise.all(load())
    expect(after.map((res) => res.status).every((status) => status === 200 || status === 201)).toBe(
      true,
    )
  })
})

describe('MariaDB stopped and started again', () => {
  it('answers 503 with Retry-After while it is down, and serves again once it is back', async () => {
    await mariadb.stop()
    const answers = await Promise.all(load())
    for (const res of answers) expectUnavailable(res)
    await mariadb.start()
    expect((await waitUntilHealthy()).body.database).toBe('up')
    const list = await request(baseUrl).get('/api/patients').set('Cookie', users.surgeon.cookie)
    expect(list.status).toBe(200)
  }, 60_000)
})

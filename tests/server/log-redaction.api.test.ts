import { Writable } from 'node:stream'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import { createApp } from '../../server/app'
import { createLogger } from '../../server/logger'
import { createDb, type Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll, workerDatabaseName } from '../support/test-db'
import { createUsersForEveryRole, testConfig, type TestUser } from '../support/test-app'

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let logLines: string[]

beforeAll(async () => {
  db = await openTestDb()
  config = testConfig()
  const captured = new Writable({
    write(chunk: Buffer, _encoding, done) {
      logLines.push(chunk.toString('utf8'))
      done()
    },
  })
  app = createApp({
    db,
    config,
    logger: createLogger('info', captured),
    clientDir: '/nonexistent',
  })
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  logLines = []
})

// An invented patient; the check below looks for each identifying value in the log.
const patient = {
  recordNumber: 'EPX-7321',
  familyName: 'Quillfeather',
  givenName: 'Orsolya',
  birthDate: '1958-11-03',
  sex: 'female',
}

describe('the application log on an unexpected database error', () => {
  it('holds neither the SQL values nor the request body of a patient write', async () => {
    // A CHECK constraint makes MariaDB refuse every insert: an error no handler expects (a 500).
    // Changing the schema is the owner's right, not the application account's.
    const owner = createDb(workerDatabaseName(), { timeouts: null, account: 'owner' })
    await owner.raw(
      `ALTER TABLE \`${TABLES.patients}\` ADD CONSTRAINT refuse_for_log_test CHECK (CHAR_LENGTH(family_name) > 1000)`,
    )
    try {
      const res = await request(app)
        .post('/api/patients')
        .set('Cookie', users.fellow.cookie)
        // A browser labels its own writes; this scripted one says it comes from the app's pages.
        .set('Sec-Fetch-Site', 'same-origin')
        .send(patient)
      expect(res.status).toBe(500)
      expect(JSON.stringify(res.body)).not.toContain('Quillfeather')
    } finally {
      await owner.raw(`ALTER TABLE \`${TABLES.patients}\` DROP CONSTRAINT refuse_for_log_test`)
      await owner.destroy()
    }
    const log = logLines.join('')
    // The error was logged (with its error number: 4025, a failed CHECK constraint in MariaDB), so the absence below is not an empty log.
    expect(log).toMatch(/unhandled error/)
    expect(log).toMatch(/"errno":4025/)
    for (const value of [patient.familyName, patient.givenName, patient.birthDate, 'EPX-7321'])
      expect(log).not.toContain(value)
  })
})

describe('the application log of each request', () => {
  it('names the method, path and status, and no header of the answer', async () => {
    const signIn = await request(app)
      .post('/api/auth/login')
      .set('Sec-Fetch-Site', 'same-origin')
      .send({ email: users.fellow.email, password: users.fellow.password })
    expect(signIn.status).toBe(200)
    expect(signIn.headers['set-cookie']).toBeDefined()
    const line = logLines
      .map((text) => JSON.parse(text))
      .find((entry) => entry.req?.url === '/api/auth/login')
    expect(line).toMatchObject({
      req: { method: 'POST', url: '/api/auth/login' },
      res: { statusCode: 200 },
    })
    expect(Object.keys(line.res)).toEqual(['statusCode'])
    expect(logLines.join('')).not.toMatch(/set-cookie|content-security-policy/i)
  })
})

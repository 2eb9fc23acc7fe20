import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest'
import request from 'supertest'
import bcrypt from 'bcryptjs'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { signInAccountKey, signInFailureCount } from '../../server/db/sign-in-throttle'
import { BCRYPT_COST, DUMMY_HASH } from '../../server/services/auth'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createTestUser, movableClock } from '../support/test-app'

let db: Db
beforeAll(async () => {
  db = await openTestDb()
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  await truncateAll(db)
})
afterEach(() => {
  vi.restoreAllMocks()
})

function guessAll(app: Parameters<typeof request>[0], email: string, count: number) {
  return Promise.all(
    Array.from({ length: count }, (_, index) =>
      request(app)
        .post('/api/auth/login')
        .send({ email, password: `wrong-guess-${index}` }),
    ),
  )
}

describe('parallel wrong guesses against one account', () => {
  it('counts exactly the attempts that reached the password check; the rest wait', async () => {
    const { app, config } = buildTestApp(db, { LOGIN_MAX_FAILURES: '5' })
    const user = await createTestUser(db, config, 'surgeon')
    const answers = await guessAll(app, user.email, 20)
    const checked = answers.filter((res) => res.status === 401).length
    const refused = answers.filter((res) => res.status === 429)
    expect(checked + refused.length).toBe(20)
    // The fifth failure starts the pause; no guess after it reaches bcrypt.
    expect(checked).toBe(5)
    expect(await signInFailureCount(db, signInAccountKey(user.email))).toBe(checked)
    for (const res of refused) expect(Number(res.headers['retry-after'])).toBeGreaterThanOrEqual(1)
    expect(await db(TABLES.auditEvents).where({ action: 'login-failed' })).toHaveLength(checked)
  })

  it('refuses beyond the per-account budget of the shared limiter', async () => {
    const { app, config } = buildTestApp(db, {
      LOGIN_MAX_FAILURES: '100',
      LOGIN_ATTEMPTS_PER_ACCOUNT_HOUR: '8',
    })
    const user = await createTestUser(db, config, 'surgeon')
    const answers = await guessAll(app, user.email, 20)
    expect(answers.filter((res) => res.status === 401)).toHaveLength(8)
    expect(answers.filter((res) => res.status === 429)).toHaveLength(12)
    expect(await signInFailureCount(db, signInAccountKey(user.email))).toBe(8)
    // The limiter's counters are rows of the shared database, not memory of this process.
    const rows = await db(TABLES.rateLimits).where('key', 'like', 'signin-account:%')
    expect(rows).toHaveLength(1)
    expect(rows[0].points).toBe(20)
  })
})

describe('progressive delay', () => {
  it('doubles the wait after each further failure (1 s, 2 s, 4 s)', async () => {
    const clock = movableClock()
    const { app, config } = buildTestApp(db, { LOGIN_MAX_FAILURES: '2' }, { now: clock })
    const user = await createTestUser(db, config, 'fellow')
    const attempt = () =>
      request(app).post('/api/auth/login').send({ email: user.email, password: 'wrong' })
    expect((await attempt()).status).toBe(401)
    expect((await attempt()).status).toBe(401)
    const waits: string[] = []
    for (const waitMs of [1000, 2000, 4000]) {
      const refused = await attempt()
      expect(refused.status).toBe(429)
      waits.push(String(refused.headers['retry-after']))
      clock.advanceMs(waitMs)
      expect((await attempt()).status).toBe(401)
    }
    expect(waits).toEqual(['1', '2', '4'])
  })
})

describe('unknown and known addresses', () => {
  it('does the same bcrypt comparison for an unknown e-mail, against the fixed dummy hash', async () => {
    const { app } = buildTestApp(db)
    const compare = vi.spyOn(bcrypt, 'compare')
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email: 'nobody@test.example', password: 'a-guess' })
    expect(res.status).toBe(401)
    expect(compare).toHaveBeenCalledTimes(1)
    expect(compare).toHaveBeenCalledWith('a-guess', DUMMY_HASH)
    // The dummy costs what a real hash costs.
    expect(bcrypt.getRounds(DUMMY_HASH)).toBe(BCRYPT_COST)
    // And it is counted and paused like a known one.
    expect(await signInFailureCount(db, signInAccountKey('nobody@test.example'))).toBe(1)
  })
})

describe('bcrypt limits', () => {
  it('refuses a sign-in password over 72 bytes with a message instead of cutting it short', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    // bcrypt uses the first 72 bytes of the key only (Provos & Mazières 1999, §6).
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: `${user.password}${'x'.repeat(80)}` })
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/72 bytes/)
  })

  it('upgrades a hash of a lower cost to cost 12 at the next successful sign-in', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    const before = await db(TABLES.users).where({ id: user.id }).first()
    expect(bcrypt.getRounds(before.password_hash)).toBe(4)
    await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
      .expect(200)
    const after = await db(TABLES.users).where({ id: user.id }).first()
    expect(bcrypt.getRounds(after.password_hash)).toBe(12)
    expect(await bcrypt.compare(user.password, after.password_hash)).toBe(true)
    // The old password keeps working with the new hash.
    await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
      .expect(200)
  })
})

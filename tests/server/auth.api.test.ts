import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import jwt from 'jsonwebtoken'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { SESSION_COOKIE, signSessionToken, tokenSettingsOf } from '../../server/auth/session-token'
import { LOGIN_FAILED_MESSAGE } from '../../server/services/auth'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createTestUser, movableClock } from '../support/test-app'
import { signInAccountKey, signInFailureCount } from '../../server/db/sign-in-throttle'

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

function sessionCookieOf(res: request.Response): string | undefined {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? [])
  return cookies.find((cookie) => cookie.startsWith(`${SESSION_COOKIE}=`))
}

describe('POST /api/auth/login', () => {
  it('signs in with the right password and sets an httpOnly SameSite=Strict session cookie', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    expect(res.status).toBe(200)
    expect(res.body).toEqual({
      id: user.id,
      email: user.email,
      displayName: 'Test fellow',
      role: 'fellow',
    })
    const cookie = sessionCookieOf(res)
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Strict/i)
    expect(cookie).toMatch(/Max-Age=1800/)
    const me = await request(app).get('/api/auth/me').set('Cookie', cookie!.split(';')[0]!)
    expect(me.status).toBe(200)
    expect(me.body.user.role).toBe('fellow')
    const events = await db(TABLES.auditEvents).where({ action: 'login', user_id: user.id })
    expect(events).toHaveLength(1)
  })

  it('accepts the e-mail address in any letter case', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'surgeon')
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email.toUpperCase(), password: user.password })
    expect(res.status).toBe(200)
  })

  it('answers one generic message for a wrong password and for an unknown e-mail', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    const wrongPassword = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: 'nope' })
    const unknownEmail = await request(app)
      .post('/api/auth/login')
      .send({ email: 'nobody@test.example', password: 'nope' })
    for (const res of [wrongPassword, unknownEmail]) {
      expect(res.status).toBe(401)
      expect(res.body.error).toEqual({ code: 'login_failed', message: LOGIN_FAILED_MESSAGE })
      expect(sessionCookieOf(res)).toBeUndefined()
    }
    const failures = await db(TABLES.auditEvents).where({ action: 'login-failed' })
    expect(failures).toHaveLength(2)
  })

  it('pauses the account after the configured number of failures, even for the right password', async () => {
    const clock = movableClock()
    const { app, config } = buildTestApp(db, { LOGIN_MAX_FAILURES: '3' }, { now: clock })
    const user = await createTestUser(db, config, 'fellow')
    for (let i = 0; i < 3; i += 1) {
      await request(app)
        .post('/api/auth/login')
        .send({ email: user.email, password: 'wrong' })
        .expect(401)
    }
    const paused = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    expect(paused.status).toBe(429)
    expect(paused.headers['retry-after']).toBe('1')
    expect(await db(TABLES.auditEvents).where({ action: 'lockout' })).toHaveLength(1)
    // A pause, not a lock: once it has run out the right password works.
    clock.advanceMs(1000)
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    expect(res.status).toBe(200)
  })

  it('resets the failure count after a successful sign-in', async () => {
    const { app, config } = buildTestApp(db, { LOGIN_MAX_FAILURES: '3' })
    const user = await createTestUser(db, config, 'fellow')
    await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: 'wrong' })
      .expect(401)
    expect(await signInFailureCount(db, signInAccountKey(user.email))).toBe(1)
    await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
      .expect(200)
    expect(await signInFailureCount(db, signInAccountKey(user.email))).toBe(0)
  })

  it('refuses a deactivated account with the same generic message', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    await db(TABLES.users).where({ id: user.id }).update({ active: false })
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    expect(res.status).toBe(401)
    expect(res.body.error.message).toBe(LOGIN_FAILED_MESSAGE)
  })

  it('rate-limits sign-in attempts per address with 429', async () => {
    const { app } = buildTestApp(db, { LOGIN_RATE_LIMIT_PER_MINUTE: '3' })
    const statuses: number[] = []
    for (let i = 0; i < 5; i += 1) {
      const res = await request(app)
        .post('/api/auth/login')
        .send({ email: 'x@test.example', password: 'y' })
      statuses.push(res.status)
    }
    expect(statuses).toEqual([401, 401, 401, 429, 429])
  })

  it('names the field when the body is invalid', async () => {
    const { app } = buildTestApp(db)
    const res = await request(app).post('/api/auth/login').send({ email: 'not-an-address' })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('validation_failed')
    expect(res.body.error.details.email[0]).toMatch(/^email: /)
    expect(res.body.error.details.password[0]).toMatch(/^password: /)
  })

  it('answers 400 with a clear message for malformed JSON', async () => {
    const { app } = buildTestApp(db)
    const res = await request(app)
      .post('/api/auth/login')
      .set('Content-Type', 'application/json')
      .send('{"email":')
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('malformed_json')
  })
})

describe('session tokens', () => {
  it('answers 401 to a token signed with another secret', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'surgeon')
    const forged = jwt.sign({ role: 'surgeon' }, 'some-other-secret-of-enough-length', {
      subject: String(user.id),
      expiresIn: 600,
    })
    const res = await request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${forged}`)
    expect(res.status).toBe(401)
  })

  it('answers 401 to a token whose payload was edited', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    const token = user.cookie.split('=')[1]!
    const [header, , signature] = token.split('.')
    const payload = Buffer.from(
      JSON.stringify({
        sub: String(user.id),
        role: 'admin',
        exp: Math.floor(Date.now() / 1000) + 600,
      }),
    ).toString('base64url')
    const res = await request(app)
      .get('/api/auth/me')
      .set('Cookie', `${SESSION_COOKIE}=${header}.${payload}.${signature}`)
    expect(res.status).toBe(401)
  })

  it('answers 401 to an expired token', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    const expired = jwt.sign(
      { role: 'fellow', exp: Math.floor(Date.now() / 1000) - 10 },
      config.JWT_SECRET,
      { subject: String(user.id) },
    )
    const res = await request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${expired}`)
    expect(res.status).toBe(401)
    expect(res.body.error.message).toMatch(/expired or is invalid/)
  })

  it('refuses an unsigned ("none" algorithm) token', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    const unsigned = jwt.sign({ role: 'admin' }, '', {
      algorithm: 'none',
      subject: String(user.id),
      expiresIn: 600,
    })
    const res = await request(app)
      .get('/api/auth/me')
      .set('Cookie', `${SESSION_COOKIE}=${unsigned}`)
    expect(res.status).toBe(401)
  })

  it('stops accepting the session of an account deactivated after sign-in', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    expect((await request(app).get('/api/auth/me').set('Cookie', user.cookie)).status).toBe(200)
    await db(TABLES.users).where({ id: user.id }).update({ active: false })
    const res = await request(app).get('/api/auth/me').set('Cookie', user.cookie)
    expect(res.status).toBe(401)
    expect(res.body.error.message).toBe('This account is not active.')
  })

  it('renews a token past half its lifetime (sliding expiry)', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    // Signed 20 of its 30 minutes ago: 10 minutes left, under half the lifetime.
    const old = signSessionToken(user.id, 'fellow', tokenSettingsOf(config), {
      nowSeconds: Math.floor(Date.now() / 1000) - 20 * 60,
    })
    const res = await request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${old}`)
    expect(res.status).toBe(200)
    expect(sessionCookieOf(res)).toBeDefined()
    const fresh = await request(app).get('/api/auth/me').set('Cookie', user.cookie)
    expect(sessionCookieOf(fresh)).toBeUndefined()
  })

  it('logout clears the cookie and records the event', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'surgeon')
    const res = await request(app).post('/api/auth/logout').set('Cookie', user.cookie)
    expect(res.status).toBe(204)
    expect(sessionCookieOf(res)).toMatch(/Expires=Thu, 01 Jan 1970/)
    expect(await db(TABLES.auditEvents).where({ action: 'logout', user_id: user.id })).toHaveLength(
      1,
    )
  })

  it('refuses the signed-out token even if a copy of it was kept', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'surgeon')
    await request(app).post('/api/auth/logout').set('Cookie', user.cookie).expect(204)
    const res = await request(app).get('/api/auth/me').set('Cookie', user.cookie)
    expect(res.status).toBe(401)
    expect(res.body.error.message).toMatch(/signed out/)
    // A new sign-in of the same user is a new session and works.
    const login = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    const cookie = sessionCookieOf(login)!.split(';')[0]!
    expect((await request(app).get('/api/auth/me').set('Cookie', cookie)).status).toBe(200)
  })

  it('refuses a token without a session id', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'fellow')
    const legacy = jwt.sign({ role: 'fellow' }, config.JWT_SECRET, {
      subject: String(user.id),
      expiresIn: 600,
    })
    expect(
      (await request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${legacy}`)).status,
    ).toBe(401)
  })

  it('refuses a cross-site write even with a valid session', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'surgeon')
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', user.cookie)
      .set('Sec-Fetch-Site', 'cross-site')
      .send({})
    expect(res.status).toBe(403)
  })
})

describe('sibling sites', () => {
  it('refuses a write marked as coming from a sibling site', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'surgeon')
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', user.cookie)
      .set('Sec-Fetch-Site', 'same-site')
      .send({})
    expect(res.status).toBe(403)
  })
})

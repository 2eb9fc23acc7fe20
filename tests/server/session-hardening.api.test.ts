import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import jwt from 'jsonwebtoken'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import {
  HOST_SESSION_COOKIE,
  SESSION_AUDIENCE,
  SESSION_COOKIE,
  tokenSettingsOf,
} from '../../server/auth/session-token'
import { NO_ORIGIN_MESSAGE } from '../../server/middleware/same-origin'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createTestUser, movableClock } from '../support/test-app'
import { insertTestFilm, insertTestPatient, insertTestVisit } from '../support/fixtures'

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

function setCookies(res: request.Response): string[] {
  return ([] as string[]).concat(res.headers['set-cookie'] ?? [])
}

function sessionPair(res: request.Response, name = SESSION_COOKIE): string | undefined {
  return setCookies(res)
    .find((cookie) => cookie.startsWith(`${name}=`))
    ?.split(';')[0]
}

// RFC 7519 §4.1.1 and §4.1.3: a recipient rejects a token whose "iss" or "aud" it does not expect.
describe('issuer and audience of session tokens', () => {
  it('refuses a token signed with the right key but another issuer or audience', async () => {
    const { app, config } = buildTestApp(db)
    const user = await createTestUser(db, config, 'surgeon')
    const settings = tokenSettingsOf(config)
    const claims = { role: 'surgeon', sid: 'f'.repeat(32), gen: 0, auth_time: 0 }
    const sign = (issuer: string, audience: string) =>
      jwt.sign({ ...claims, auth_time: Math.floor(Date.now() / 1000) }, config.JWT_SECRET, {
        algorithm: 'HS256',
        subject: String(user.id),
        expiresIn: 600,
        issuer,
        audience,
      })
    const me = (token: string) =>
      request(app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${token}`)
    expect((await me(sign(settings.issuer, SESSION_AUDIENCE))).status).toBe(200)
    expect((await me(sign('https://other-deployment.example', SESSION_AUDIENCE))).status).toBe(401)
    expect((await me(sign(settings.issuer, 'some-other-purpose'))).status).toBe(401)
  })
})

describe('absolute session lifetime', () => {
  it('stops renewing 12 hours (the default) after sign-in, however active the session', async () => {
    const start = new Date('2026-06-01T07:00:00Z')
    const clock = movableClock(start)
    const { app, config } = buildTestApp(db, {}, { now: clock })
    const user = await createTestUser(db, config, 'fellow')
    const login = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    let cookie = sessionPair(login)!
    const endMs = start.getTime() + 12 * 3_600_000
    // A request every 20 minutes: past half the 30-minute lifetime, so each one renews.
    while (clock().getTime() + 20 * 60_000 < endMs) {
      clock.advanceMs(20 * 60_000)
      const res = await request(app).get('/api/auth/me').set('Cookie', cookie)
      expect(res.status).toBe(200)
      expect(res.body.session.endsAt).toBe(new Date(endMs).toISOString())
      cookie = sessionPair(res) ?? cookie
    }
    const lastToken = jwt.decode(cookie.split('=')[1]!) as { exp: number; auth_time: number }
    expect(lastToken.auth_time).toBe(start.getTime() / 1000)
    expect(lastToken.exp).toBeLessThanOrEqual(endMs / 1000)
    clock.advanceMs(endMs - clock().getTime() + 1000)
    const after = await request(app).get('/api/auth/me').set('Cookie', cookie)
    expect(after.status).toBe(401)
  })

  it('ends a session older than a shortened longest-session setting at its next renewal', async () => {
    const clock = movableClock(new Date('2026-06-01T07:00:00Z'))
    const { app, config } = buildTestApp(db, {}, { now: clock })
    const user = await createTestUser(db, config, 'fellow')
    const login = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    let cookie = sessionPair(login)!
    for (let step = 0; step < 4; step += 1) {
      clock.advanceMs(20 * 60_000)
      cookie = sessionPair(await request(app).get('/api/auth/me').set('Cookie', cookie)) ?? cookie
    }
    await db(TABLES.siteSettings).insert({ key: 'sessionAbsoluteHours', value: '1', version: 1 })
    clock.advanceMs(20 * 60_000)
    const res = await request(app).get('/api/auth/me').set('Cookie', cookie)
    expect(res.status).toBe(401)
    expect(res.body.error.message).toMatch(/longest time a session may last/)
  })
})

describe('writes without Sec-Fetch-Site', () => {
  it('refuses a write from another origin and keeps the film', async () => {
    const { app, config } = buildTestApp(db, {}, { bare: true })
    const fellow = await createTestUser(db, config, 'fellow')
    const patientId = await insertTestPatient(db, fellow.id)
    const visitId = await insertTestVisit(db, patientId, fellow.id)
    const filmId = await insertTestFilm(db, visitId, fellow.id)
    const res = await request(app)
      .delete(`/api/images/${filmId}`)
      .set('Cookie', fellow.cookie)
      .set('Origin', 'http://evil.example')
    expect(res.status).toBe(403)
    expect(res.body.error.message).toMatch(/Cross-site/)
    expect(await db(TABLES.images).where({ id: filmId }).first()).toBeDefined()
  })

  it('refuses a write that names neither its site nor its origin', async () => {
    const { app, config } = buildTestApp(db, {}, { bare: true })
    const fellow = await createTestUser(db, config, 'fellow')
    const res = await request(app).post('/api/auth/logout').set('Cookie', fellow.cookie)
    expect(res.status).toBe(403)
    expect(res.body.error.message).toBe(NO_ORIGIN_MESSAGE)
  })

  it('accepts an Origin equal to PUBLIC_URL, or to the request host without PUBLIC_URL', async () => {
    const withPublic = buildTestApp(db, { PUBLIC_URL: 'https://endplate.example/' }, { bare: true })
    const fellow = await createTestUser(db, withPublic.config, 'fellow')
    expect(
      (
        await request(withPublic.app)
          .post('/api/auth/logout')
          .set('Cookie', fellow.cookie.replace(SESSION_COOKIE, HOST_SESSION_COOKIE))
          .set('Origin', 'https://endplate.example')
      ).status,
    ).toBe(204)
    const hostOnly = buildTestApp(db, { PUBLIC_URL: '' }, { bare: true })
    const other = await createTestUser(db, hostOnly.config, 'surgeon')
    expect(
      (
        await request(hostOnly.app)
          .post('/api/auth/logout')
          .set('Cookie', other.cookie)
          .set('Host', 'endplate.local:8443')
          .set('Origin', 'http://endplate.local:8443')
      ).status,
    ).toBe(204)
    expect(
      (
        await request(hostOnly.app)
          .post('/api/auth/logout')
          .set('Cookie', other.cookie)
          .set('Host', 'endplate.local:8443')
          .set('Origin', 'http://endplate.local:8444')
      ).status,
    ).toBe(403)
  })
})

describe('cookie and transport security from PUBLIC_URL', () => {
  it('over HTTPS: a Secure __Host- cookie and HSTS, whatever NODE_ENV says', async () => {
    const { app, config } = buildTestApp(db, { PUBLIC_URL: 'https://endplate.example' })
    const user = await createTestUser(db, config, 'fellow')
    const login = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    expect(login.status).toBe(200)
    // RFC 6265bis §4.1.3.2: __Host- cookies are Secure, Path=/ and carry no Domain.
    const cookie = setCookies(login).find((text) => text.startsWith(`${HOST_SESSION_COOKIE}=`))
    expect(cookie).toMatch(/; Secure/)
    expect(cookie).toMatch(/; Path=\//)
    expect(cookie).not.toMatch(/Domain=/i)
    expect(login.headers['strict-transport-security']).toMatch(/max-age=\d+/)
    const me = await request(app).get('/api/auth/me').set('Cookie', cookie!.split(';')[0]!)
    expect(me.body.user.email).toBe(user.email)
  })

  it('over plain HTTP: no Secure flag and no HSTS, even with NODE_ENV=production', async () => {
    const { app, config } = buildTestApp(db, {
      NODE_ENV: 'production',
      MAIL_FAKE: 'false',
      PUBLIC_URL: 'http://endplate.local',
    })
    const user = await createTestUser(db, config, 'fellow')
    const login = await request(app)
      .post('/api/auth/login')
      .send({ email: user.email, password: user.password })
    const cookie = setCookies(login).find((text) => text.startsWith(`${SESSION_COOKIE}=`))
    expect(cookie).not.toMatch(/Secure/)
    expect(login.headers['strict-transport-security']).toBeUndefined()
  })
})

describe('GET /api/auth/me signed out', () => {
  it('answers 200 with no user, not an error', async () => {
    const { app } = buildTestApp(db)
    const res = await request(app).get('/api/auth/me')
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ user: null, session: null })
  })
})

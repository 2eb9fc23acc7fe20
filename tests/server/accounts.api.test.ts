import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import bcrypt from 'bcryptjs'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { SESSION_COOKIE } from '../../server/auth/session-token'
import { hashOneTimeToken } from '../../server/auth/one-time-token'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  movableClock,
  type TestUser,
} from '../support/test-app'
import { linkPathOf, startTestMail, type TestMail } from '../support/mail'

let db: Db
let app: Express
let config: AppConfig
let clock: ReturnType<typeof movableClock>
let users: Record<Role, TestUser>
let mail: TestMail

const GOOD_PASSWORD = 'lordosis-angle-41'

beforeAll(async () => {
  db = await openTestDb()
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  await truncateAll(db)
  // The database stamps rows with its own clock; the app's starts a little ahead of it.
  clock = movableClock(new Date(Date.now() + 1000))
  ;({ app, config } = buildTestApp(db, {}, { now: clock }))
  users = await createUsersForEveryRole(db, config)
  mail = await startTestMail(db)
})
afterEach(async () => {
  await mail.close()
})

function sessionCookieOf(res: request.Response): string | undefined {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? [])
  return cookies.find((cookie) => cookie.startsWith(`${SESSION_COOKIE}=`))?.split(';')[0]
}

async function invite(email = 'new.fellow@test.example', role: Role = 'fellow') {
  const res = await request(app)
    .post('/api/invitations')
    .set('Cookie', users.admin.cookie)
    .send({ email, displayName: 'Dr Wren Haldane', role })
  expect(res.status).toBe(201)
  const before = (await db(TABLES.caughtMails).where({ to_address: email })).length
  const caught = (await mail.deliver()).filter((item) => item.to === email)
  expect(caught).toHaveLength(before + 1)
  const latest = caught[caught.length - 1]!
  return { invitation: res.body, caught: latest, token: linkPathOf(latest).split('/')[2]! }
}

describe('invitations', () => {
  it('mails a single-use link; the invited person sets a password and is signed in', async () => {
    const { invitation, caught, token } = await invite()
    expect(invitation).toMatchObject({ email: 'new.fellow@test.example', role: 'fellow' })
    expect(caught.subject).toBe('Your invitation to Endplate')
    expect(caught.text).toMatch(/within 3 days/)
    expect(linkPathOf(caught)).toMatch(/^\/invitation\/[A-Za-z0-9_-]{43}$/)
    // 256 random bits, of which only the hash is stored.
    const row = await db(TABLES.invitations).first()
    expect(row.token_hash).toBe(hashOneTimeToken(token))
    expect(JSON.stringify(row)).not.toContain(token)

    const preview = await request(app).get(`/api/invitations/${token}`)
    expect(preview.status).toBe(200)
    expect(preview.body).toMatchObject({
      email: 'new.fellow@test.example',
      role: 'fellow',
      displayName: 'Dr Wren Haldane',
    })
    const accepted = await request(app)
      .post(`/api/invitations/${token}/accept`)
      .send({ password: GOOD_PASSWORD })
    expect(accepted.status).toBe(201)
    expect(accepted.body).toMatchObject({ email: 'new.fellow@test.example', role: 'fellow' })
    const me = await request(app).get('/api/auth/me').set('Cookie', sessionCookieOf(accepted)!)
    expect(me.body.user.email).toBe('new.fellow@test.example')
    const login = await request(app)
      .post('/api/auth/login')
      .send({ email: 'new.fellow@test.example', password: GOOD_PASSWORD })
    expect(login.status).toBe(200)

    // Single use: the link is gone, and a second account is never made.
    expect((await request(app).get(`/api/invitations/${token}`)).status).toBe(404)
    const again = await request(app)
      .post(`/api/invitations/${token}/accept`)
      .send({ password: GOOD_PASSWORD })
    expect(again.status).toBe(404)
    expect(again.body.error.message).toMatch(/no longer valid/)
    expect(await db(TABLES.users).where({ email: 'new.fellow@test.example' })).toHaveLength(1)
    expect((await db(TABLES.auditEvents).where({ action: 'invite' })).length).toBe(1)
    expect((await db(TABLES.auditEvents).where({ action: 'accept' })).length).toBe(1)
  })

  it('expires after the invitation lifetime of the site settings', async () => {
    await db(TABLES.siteSettings).insert({ key: 'invitationLifetimeHours', value: '2' })
    const { token, caught } = await invite()
    expect(caught.text).toMatch(/within 2 hours/)
    clock.advanceMs(2 * 3_600_000 - 60_000)
    expect((await request(app).get(`/api/invitations/${token}`)).status).toBe(200)
    clock.advanceMs(120_000)
    expect((await request(app).get(`/api/invitations/${token}`)).status).toBe(404)
    const late = await request(app)
      .post(`/api/invitations/${token}/accept`)
      .send({ password: GOOD_PASSWORD })
    expect(late.status).toBe(404)
    expect(await db(TABLES.users).where({ email: 'new.fellow@test.example' })).toHaveLength(0)
  })

  it('lists pending invitations, lets a new one replace the old, and withdraws one', async () => {
    const first = await invite()
    const second = await invite()
    expect((await request(app).get(`/api/invitations/${first.token}`)).status).toBe(404)
    const list = await request(app).get('/api/invitations').set('Cookie', users.admin.cookie)
    expect(list.body.map((item: { id: number }) => item.id)).toEqual([second.invitation.id])
    expect(JSON.stringify(list.body)).not.toContain(second.token)
    const revoked = await request(app)
      .delete(`/api/invitations/${second.invitation.id}`)
      .set('Cookie', users.admin.cookie)
    expect(revoked.status).toBe(204)
    expect((await request(app).get(`/api/invitations/${second.token}`)).status).toBe(404)
    expect(await db(TABLES.auditEvents).where({ action: 'revoke' })).toHaveLength(1)
  })

  it('refuses an address that has an account, bad input, and everyone but administrators', async () => {
    const existing = await request(app)
      .post('/api/invitations')
      .set('Cookie', users.admin.cookie)
      .send({ email: users.fellow.email.toUpperCase(), displayName: 'Again', role: 'fellow' })
    expect(existing.status).toBe(409)
    for (const body of [
      { email: 'not-an-address', displayName: 'X', role: 'fellow' },
      { email: 'a@test.example', displayName: '', role: 'fellow' },
      { email: 'a@test.example', displayName: 'X', role: 'owner' },
    ]) {
      const res = await request(app)
        .post('/api/invitations')
        .set('Cookie', users.admin.cookie)
        .send(body)
      expect(res.status).toBe(400)
    }
    for (const who of [users.surgeon, users.fellow, users.researcher]) {
      const res = await request(app)
        .post('/api/invitations')
        .set('Cookie', who.cookie)
        .send({ email: 'x@test.example', displayName: 'X', role: 'fellow' })
      expect(res.status).toBe(403)
    }
    expect(await db(TABLES.invitations)).toHaveLength(0)
    expect(await db(TABLES.mailOutbox)).toHaveLength(0)
  })

  it.each([
    ['11 characters', 'short-pass1', /at least 12 characters/],
    ['73 bytes', 'a'.repeat(73), /at most 72 bytes/],
    ['37 two-byte letters (74 bytes)', 'é'.repeat(37), /at most 72 bytes/],
    ['the e-mail name', 'my-new.fellow-password', /name part of your e-mail address/],
  ])(
    'refuses a password of %s, naming the rule, and creates no account',
    async (_label, password, rule) => {
      const { token } = await invite()
      const res = await request(app).post(`/api/invitations/${token}/accept`).send({ password })
      expect(res.status).toBe(400)
      expect(res.body.error.message).toMatch(rule)
      expect((await request(app).get(`/api/invitations/${token}`)).status).toBe(200)
    },
  )

  it('takes a password of exactly 72 bytes whole: bcrypt compares every byte of it', async () => {
    const { token } = await invite()
    const password = `${'x'.repeat(70)}yz`
    const res = await request(app).post(`/api/invitations/${token}/accept`).send({ password })
    expect(res.status).toBe(201)
    const row = await db(TABLES.users).where({ email: 'new.fellow@test.example' }).first()
    // bcryptjs (an independent implementation) reads 72 bytes: the last one still counts.
    expect(await bcrypt.compare(password, row.password_hash)).toBe(true)
    expect(await bcrypt.compare(`${'x'.repeat(70)}y!`, row.password_hash)).toBe(false)
  })
})

describe('password reset', () => {
  async function askReset(email: string) {
    const res = await request(app).post('/api/auth/password-reset').send({ email })
    expect(res.status).toBe(202)
    return res
  }

  it('answers 202 whether or not the account exists, and mails only a real one', async () => {
    const unknown = await askReset('nobody@test.example')
    const known = await askReset(users.fellow.email)
    expect(unknown.body).toEqual(known.body)
    const caught = await mail.deliver()
    expect(caught.map((item) => item.to)).toEqual([users.fellow.email])
    expect(caught[0]!.subject).toBe('Reset your Endplate password')
    expect(linkPathOf(caught[0]!)).toMatch(/^\/password-reset\/[A-Za-z0-9_-]{43}$/)
    expect(await db(TABLES.auditEvents).where({ action: 'password-reset-requested' })).toHaveLength(
      2,
    )
  })

  it('sets the password once, ends every session of the user, and keeps the old one from working', async () => {
    await askReset(users.fellow.email)
    const [caught] = await mail.deliver()
    const token = linkPathOf(caught!).split('/')[2]!
    expect((await request(app).get(`/api/auth/password-reset/${token}`)).body.email).toBe(
      users.fellow.email,
    )
    const set = await request(app)
      .post(`/api/auth/password-reset/${token}`)
      .send({ password: GOOD_PASSWORD })
    expect(set.status).toBe(204)
    // The session the fellow had before is over.
    const before = await request(app).get('/api/auth/me').set('Cookie', users.fellow.cookie)
    expect(before.status).toBe(401)
    expect(before.body.error.message).toMatch(/session was ended/)
    const oldLogin = await request(app)
      .post('/api/auth/login')
      .send({ email: users.fellow.email, password: users.fellow.password })
    expect(oldLogin.status).toBe(401)
    const newLogin = await request(app)
      .post('/api/auth/login')
      .send({ email: users.fellow.email, password: GOOD_PASSWORD })
    expect(newLogin.status).toBe(200)
    expect(
      (await request(app).get('/api/auth/me').set('Cookie', sessionCookieOf(newLogin)!)).status,
    ).toBe(200)
    const reuse = await request(app)
      .post(`/api/auth/password-reset/${token}`)
      .send({ password: 'another-fine-passphrase' })
    expect(reuse.status).toBe(404)
    expect(await db(TABLES.auditEvents).where({ action: 'password-reset' })).toHaveLength(1)
  })

  it('expires after one hour, and a newer link retires the older one', async () => {
    await askReset(users.fellow.email)
    const [first] = await mail.deliver()
    await askReset(users.fellow.email)
    const second = (await mail.deliver())[1]!
    const firstToken = linkPathOf(first!).split('/')[2]!
    const secondToken = linkPathOf(second).split('/')[2]!
    expect((await request(app).get(`/api/auth/password-reset/${firstToken}`)).status).toBe(404)
    clock.advanceMs(59 * 60_000)
    expect((await request(app).get(`/api/auth/password-reset/${secondToken}`)).status).toBe(200)
    clock.advanceMs(2 * 60_000)
    const late = await request(app)
      .post(`/api/auth/password-reset/${secondToken}`)
      .send({ password: GOOD_PASSWORD })
    expect(late.status).toBe(404)
    expect(late.body.error.message).toMatch(/more than an hour old/)
  })
})

describe('PATCH /api/users/:id', () => {
  it("deactivating refuses the user's token on the very next request", async () => {
    expect((await request(app).get('/api/auth/me').set('Cookie', users.fellow.cookie)).status).toBe(
      200,
    )
    const res = await request(app)
      .patch(`/api/users/${users.fellow.id}`)
      .set('Cookie', users.admin.cookie)
      .send({ active: false })
    expect(res.status).toBe(200)
    expect(res.body.active).toBe(false)
    const next = await request(app).get('/api/patients').set('Cookie', users.fellow.cookie)
    expect(next.status).toBe(401)
    // Reactivated, the account signs in afresh; the old token stays ended.
    await request(app)
      .patch(`/api/users/${users.fellow.id}`)
      .set('Cookie', users.admin.cookie)
      .send({ active: true })
    expect((await request(app).get('/api/auth/me').set('Cookie', users.fellow.cookie)).status).toBe(
      401,
    )
    const events = await db(TABLES.auditEvents).where({ action: 'update', entity: 'user' })
    expect(events.map((event) => event.summary)).toEqual([
      `Changed user ${users.fellow.id}: deactivated; sessions ended`,
      `Changed user ${users.fellow.id}: reactivated`,
    ])
  })

  it('changes role and name; a new role takes effect on the next request', async () => {
    const res = await request(app)
      .patch(`/api/users/${users.fellow.id}`)
      .set('Cookie', users.admin.cookie)
      .send({ role: 'surgeon', displayName: 'Dr Fellow Promoted' })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ role: 'surgeon', displayName: 'Dr Fellow Promoted' })
    const me = await request(app).get('/api/auth/me').set('Cookie', users.fellow.cookie)
    expect(me.body.user.role).toBe('surgeon')
  })

  it('never deactivates or demotes the last active administrator', async () => {
    for (const body of [{ active: false }, { role: 'surgeon' }]) {
      const res = await request(app)
        .patch(`/api/users/${users.admin.id}`)
        .set('Cookie', users.admin.cookie)
        .send(body)
      expect(res.status).toBe(409)
      expect(res.body.error.message).toMatch(/at least one active administrator/)
    }
    const second = await createTestUser(db, config, 'admin', 'second.admin@test.example')
    const res = await request(app)
      .patch(`/api/users/${users.admin.id}`)
      .set('Cookie', second.cookie)
      .send({ role: 'surgeon' })
    expect(res.status).toBe(200)
    const last = await request(app)
      .patch(`/api/users/${second.id}`)
      .set('Cookie', second.cookie)
      .send({ active: false })
    expect(last.status).toBe(409)
  })

  it('refuses non-administrators, unknown users and empty or unknown changes', async () => {
    for (const who of [users.surgeon, users.fellow, users.researcher]) {
      const res = await request(app)
        .patch(`/api/users/${users.fellow.id}`)
        .set('Cookie', who.cookie)
        .send({ active: false })
      expect(res.status).toBe(403)
    }
    const missing = await request(app)
      .patch('/api/users/999999')
      .set('Cookie', users.admin.cookie)
      .send({ active: false })
    expect(missing.status).toBe(404)
    for (const body of [{}, { email: 'x@test.example' }, { role: 'owner' }]) {
      const res = await request(app)
        .patch(`/api/users/${users.fellow.id}`)
        .set('Cookie', users.admin.cookie)
        .send(body)
      expect(res.status).toBe(400)
    }
  })
})

import { createServer } from 'node:net'
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import { pino } from 'pino'
import nodemailer from 'nodemailer'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { createMailSender, retryDelayMs } from '../../server/mail/mail-sender'
import type { Role } from '../../shared/types/domain'
import type { Reading } from '../../shared/types/readings'
import type { CaughtMail } from '../../shared/types/mail'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  movableClock,
  type TestUser,
} from '../support/test-app'
import {
  insertStudyWith,
  insertTestFilm,
  insertTestPatient,
  insertTestVisit,
  SLIP_25_PERCENT_POINTS,
} from '../support/fixtures'
import { linkPathOf, startTestMail, type TestMail } from '../support/mail'

const PATIENT = {
  recordNumber: 'TST-MAIL-7',
  familyName: 'Vandermolen',
  givenName: 'Isaura',
  studyCode: 'EP-MAIL7',
}

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let patientId: number
let imageId: number
let mail: TestMail

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
  patientId = await insertTestPatient(db, users.fellow.id, PATIENT)
  const visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-02')
  imageId = await insertTestFilm(db, visitId, users.fellow.id)
  await insertStudyWith(db, users.researcher.id, [patientId])
  mail = await startTestMail(db)
})
afterEach(async () => {
  await mail.close()
})

const post = (who: TestUser, path: string, body: object = {}) =>
  request(app).post(path).set('Cookie', who.cookie).send(body)

async function submittedReading(): Promise<Reading> {
  const created = await post(users.fellow, `/api/images/${imageId}/readings`, {
    template: 'slip-grade',
    options: { segment: 'L5-S1' },
    points: SLIP_25_PERCENT_POINTS,
  })
  const res = await post(users.fellow, `/api/readings/${created.body.id}/submit`, {
    version: created.body.version,
  })
  expect(res.status).toBe(200)
  return res.body
}

/**
 * What every mail about a reading must be: to the right person, with a plain-text body that
 * names the study code, visit kind and date but never the patient, and one link that opens the
 * reading for its recipient.
 */
async function expectReadingMail(
  caught: CaughtMail,
  recipient: TestUser,
  reading: Reading,
  subject: RegExp,
): Promise<void> {
  expect(caught.to).toBe(recipient.email)
  expect(caught.subject).toMatch(subject)
  expect(caught.text).toContain(`study code ${PATIENT.studyCode}`)
  expect(caught.text).toContain('pre-op, 2 Mar 2026')
  for (const identifying of [PATIENT.familyName, PATIENT.givenName, PATIENT.recordNumber])
    expect(`${caught.subject}\n${caught.text}`).not.toContain(identifying)
  const path = linkPathOf(caught)
  expect(path).toBe(`/readings/${reading.id}`)
  // The page the link opens is the reading the recipient may open.
  const opened = await request(app).get(`/api${path}`).set('Cookie', recipient.cookie)
  expect(opened.status).toBe(200)
  expect(opened.body.id).toBe(reading.id)
}

describe('mail for reading events', () => {
  it("mails a submission to the patient's responsible surgeon only", async () => {
    const other = await createTestUser(db, config, 'surgeon', 'other.surgeon@test.example')
    await db(TABLES.patients).where({ id: patientId }).update({ responsible_surgeon_id: other.id })
    const reading = await submittedReading()
    const caught = await mail.deliver()
    expect(caught).toHaveLength(1)
    await expectReadingMail(caught[0]!, other, reading, /^Reading to sign: Slip grade L5-S1/)
    expect(caught[0]!.text).toContain('Test fellow submitted a reading for your signature.')
  })

  it('mails every other surgeon when the patient has no responsible surgeon', async () => {
    const other = await createTestUser(db, config, 'surgeon', 'other.surgeon@test.example')
    const reading = await submittedReading()
    const caught = await mail.deliver()
    expect(caught.map((item) => item.to).sort()).toEqual([other.email, users.surgeon.email].sort())
    for (const item of caught) {
      const recipient = item.to === other.email ? other : users.surgeon
      await expectReadingMail(item, recipient, reading, /^Reading to sign/)
    }
  })

  it('mails the rater when the reading is signed, and when it is returned (without the comment)', async () => {
    const first = await submittedReading()
    await mail.deliver()
    const signed = await post(users.surgeon, `/api/readings/${first.id}/sign`, {
      version: first.version,
    })
    expect(signed.status).toBe(200)
    const second = await submittedReading()
    const comment = `Vandermolen film: the S1 corner is on the wrong endplate`
    const returned = await post(users.surgeon, `/api/readings/${second.id}/return`, {
      version: second.version,
      comment,
    })
    expect(returned.status).toBe(200)
    const caught = (await mail.deliver()).filter((item) => item.to === users.fellow.email)
    expect(caught).toHaveLength(2)
    await expectReadingMail(caught[0]!, users.fellow, first, /^Reading signed: /)
    await expectReadingMail(caught[1]!, users.fellow, second, /^Reading returned for changes: /)
    expect(caught[1]!.text).not.toContain('wrong endplate')
  })

  it('mails a comment to the other party, not to its author', async () => {
    const reading = await submittedReading()
    await post(users.surgeon, `/api/readings/${reading.id}/comments`, { text: 'Which film?' })
    const [toFellow, ...rest] = (await mail.deliver()).filter((item) =>
      item.subject.startsWith('New comment'),
    )
    expect(rest).toHaveLength(0)
    await expectReadingMail(toFellow!, users.fellow, reading, /^New comment on a reading/)
    await post(users.fellow, `/api/readings/${reading.id}/comments`, { text: 'The neutral one.' })
    const answers = (await mail.deliver()).filter(
      (item) => item.subject.startsWith('New comment') && item.to === users.surgeon.email,
    )
    expect(answers).toHaveLength(1)
  })
})

/** A port of 127.0.0.1 where nothing listens. */
async function deadPort(): Promise<number> {
  const server = createServer()
  await new Promise<void>((resolveListen) => server.listen(0, '127.0.0.1', () => resolveListen()))
  const { port } = server.address() as { port: number }
  await new Promise<void>((resolveClose) => server.close(() => resolveClose()))
  return port
}

describe('the outbox and its sender', () => {
  it('backs off exponentially from the first wait, up to an hour', () => {
    expect([1, 2, 3, 4].map((n) => retryDelayMs(n, 30_000))).toEqual([
      30_000, 60_000, 120_000, 240_000,
    ])
    expect(retryDelayMs(20, 30_000)).toBe(3_600_000)
  })

  it('never fails the action when the mail server is down; retries with backoff, then shows the failure', async () => {
    const clock = movableClock(new Date(Date.now() + 1000))
    const broken = createMailSender({
      db,
      logger: pino({ level: 'silent' }),
      from: 'Endplate <endplate@clinic.invalid>',
      publicUrl: 'http://endplate.test.invalid',
      smtp: { host: '127.0.0.1', port: await deadPort(), ignoreTls: true },
      now: clock,
      maxAttempts: 3,
      firstRetryMs: 10_000,
    })
    try {
      await submittedReading()
      expect(await broken.runOnce()).toBe(0)
      let row = await db(TABLES.mailOutbox).first()
      expect(row).toMatchObject({ status: 'pending', attempts: 1 })
      expect(row.error).toMatch(/ECONNREFUSED|connect/i)
      expect(new Date(row.next_attempt_at).getTime()).toBe(clock().getTime() + 10_000)
      // Not due yet: nothing is tried.
      await broken.runOnce()
      expect((await db(TABLES.mailOutbox).first()).attempts).toBe(1)
      clock.advanceMs(10_000)
      await broken.runOnce()
      row = await db(TABLES.mailOutbox).first()
      expect(row.attempts).toBe(2)
      expect(new Date(row.next_attempt_at).getTime()).toBe(clock().getTime() + 20_000)
      clock.advanceMs(20_000)
      await broken.runOnce()
      row = await db(TABLES.mailOutbox).first()
      expect(row).toMatchObject({ status: 'failed', attempts: 3 })

      const undelivered = await request(app)
        .get('/api/mail/undelivered')
        .set('Cookie', users.admin.cookie)
      expect(undelivered.status).toBe(200)
      expect(undelivered.body.total).toBe(1)
      expect(undelivered.body.items[0]).toMatchObject({
        to: users.surgeon.email,
        status: 'failed',
        attempts: 3,
        nextAttemptAt: null,
      })
      expect(undelivered.body.items[0]).not.toHaveProperty('text')

      const resend = await request(app)
        .post(`/api/mail/undelivered/${row.id}/resend`)
        .set('Cookie', users.admin.cookie)
      expect(resend.status).toBe(204)
      const caught = await mail.deliver()
      expect(caught.map((item) => item.to)).toEqual([users.surgeon.email])
      expect(await db(TABLES.mailOutbox).first()).toMatchObject({ status: 'sent', link_path: null })
      expect(await db(TABLES.auditEvents).where({ action: 'mail-resend' })).toHaveLength(1)
    } finally {
      await broken.stop()
    }
  })

  it('sends a mail once although two senders look at the outbox together', async () => {
    await submittedReading()
    const second = await startTestMail(db)
    try {
      await Promise.all([mail.sender.runOnce(), second.sender.runOnce()])
      expect(await db(TABLES.caughtMails)).toHaveLength(1)
    } finally {
      await second.close()
    }
  })
})

describe('GET /api/mail', () => {
  it('lists what the fake caught, newest first, to administrators only', async () => {
    const transport = nodemailer.createTransport({
      host: '127.0.0.1',
      port: mail.catcher.port,
      ignoreTLS: true,
    })
    for (const subject of ['First', 'Second'])
      await transport.sendMail({
        from: 'a@test.invalid',
        to: 'b@test.invalid',
        subject,
        text: 'Hi',
      })
    transport.close()
    const res = await request(app).get('/api/mail').set('Cookie', users.admin.cookie)
    expect(res.status).toBe(200)
    expect(res.body.total).toBe(2)
    expect(res.body.items.map((item: CaughtMail) => item.subject)).toEqual(['Second', 'First'])
    expect(res.body.items[0]).toEqual({
      id: expect.any(Number),
      to: 'b@test.invalid',
      subject: 'Second',
      text: 'Hi\n',
      receivedAt: expect.any(String),
    })
    for (const who of [users.surgeon, users.fellow, users.researcher])
      expect((await request(app).get('/api/mail').set('Cookie', who.cookie)).status).toBe(403)
  })

  it('answers 404 when the fake is off', async () => {
    const { app: relayed } = buildTestApp(db, { MAIL_FAKE: 'false' })
    const res = await request(relayed).get('/api/mail').set('Cookie', users.admin.cookie)
    expect(res.status).toBe(404)
    expect(res.body.error.message).toMatch(/MAIL_FAKE=false/)
  })
})

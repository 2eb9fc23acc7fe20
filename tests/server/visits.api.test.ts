import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let patientId: number

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
  patientId = await insertTestPatient(db, users.fellow.id, { birthDate: '1970-05-17' })
})

describe('visits', () => {
  it('adds a visit, audits it and lists visits in time order with the age at each', async () => {
    await insertTestVisit(db, patientId, users.fellow.id, '2026-06-01', 'post-op')
    const res = await request(app)
      .post(`/api/patients/${patientId}/visits`)
      .set('Cookie', users.fellow.cookie)
      .send({ visitDate: '2026-01-10', visitKind: 'pre-op', indication: 'Claudication' })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      visitKind: 'pre-op',
      visitDate: '2026-01-10',
      ageAtVisitYears: 55,
      monthsSinceSurgery: null,
    })
    const list = await request(app)
      .get(`/api/patients/${patientId}/visits`)
      .set('Cookie', users.surgeon.cookie)
    expect(list.body.map((v: { visitDate: string }) => v.visitDate)).toEqual([
      '2026-01-10',
      '2026-06-01',
    ])
    expect(await db(TABLES.auditEvents).where({ entity: 'visit', action: 'create' })).toHaveLength(
      1,
    )
  })

  it.each([
    [
      { visitDate: '2026-13-01', visitKind: 'pre-op' },
      'visitDate',
      'visitDate: is not a real calendar date',
    ],
    [
      { visitDate: '2999-01-01', visitKind: 'pre-op' },
      'visitDate',
      'visitDate: cannot be in the future',
    ],
    [
      { visitDate: '2026-01-01', visitKind: 'checkup' },
      'visitKind',
      'visitKind: must be one of pre-op, post-op, follow-up',
    ],
    [
      { visitDate: '2026-01-01', visitKind: 'follow-up' },
      'monthsSinceSurgery',
      'monthsSinceSurgery: is required for a follow-up visit',
    ],
    [
      { visitDate: '2026-01-01', visitKind: 'follow-up', monthsSinceSurgery: -2 },
      'monthsSinceSurgery',
      'monthsSinceSurgery: cannot be negative',
    ],
    [
      { visitDate: '2026-01-01', visitKind: 'pre-op', monthsSinceSurgery: 6 },
      'monthsSinceSurgery',
      'monthsSinceSurgery: applies to follow-up visits only',
    ],
    [
      { visitDate: '1960-01-01', visitKind: 'pre-op' },
      'visitDate',
      'visitDate: cannot be before the date of birth',
    ],
  ])('answers 400 for %j naming the field and stores nothing', async (body, field, message) => {
    const res = await request(app)
      .post(`/api/patients/${patientId}/visits`)
      .set('Cookie', users.fellow.cookie)
      .send(body)
    expect(res.status).toBe(400)
    expect(res.body.error.details[field]).toContain(message)
    expect(await db(TABLES.visits).count({ c: '*' })).toEqual([{ c: 0 }])
  })

  it('answers 404 for a visit of an unknown patient', async () => {
    const res = await request(app)
      .post('/api/patients/424242/visits')
      .set('Cookie', users.fellow.cookie)
      .send({ visitDate: '2026-01-01', visitKind: 'pre-op' })
    expect(res.status).toBe(404)
  })

  it('patches a visit with optimistic locking', async () => {
    const visitId = await insertTestVisit(db, patientId, users.fellow.id)
    const ok = await request(app)
      .patch(`/api/visits/${visitId}`)
      .set('Cookie', users.fellow.cookie)
      .send({ visitKind: 'follow-up', monthsSinceSurgery: 12, version: 1 })
    expect(ok.status).toBe(200)
    expect(ok.body).toMatchObject({ visitKind: 'follow-up', monthsSinceSurgery: 12, version: 2 })
    const stale = await request(app)
      .patch(`/api/visits/${visitId}`)
      .set('Cookie', users.surgeon.cookie)
      .send({ indication: 'late', version: 1 })
    expect(stale.status).toBe(409)
    expect((await db(TABLES.visits).where({ id: visitId }).first()).indication).toBe(
      'Invented indication text',
    )
  })

  it('clears the interval when a follow-up becomes a post-op visit', async () => {
    const visitId = await insertTestVisit(db, patientId, users.fellow.id)
    await request(app)
      .patch(`/api/visits/${visitId}`)
      .set('Cookie', users.fellow.cookie)
      .send({ visitKind: 'follow-up', monthsSinceSurgery: 3, version: 1 })
      .expect(200)
    const res = await request(app)
      .patch(`/api/visits/${visitId}`)
      .set('Cookie', users.fellow.cookie)
      .send({ visitKind: 'post-op', version: 2 })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ visitKind: 'post-op', monthsSinceSurgery: null })
    const stored = await db(TABLES.visits).where({ id: visitId }).first()
    expect(stored).toMatchObject({ kind: 'post-op', months_since_surgery: null })
  })

  it('answers 404 for an unknown visit', async () => {
    expect(
      (await request(app).get('/api/visits/777777').set('Cookie', users.fellow.cookie)).status,
    ).toBe(404)
  })
})

describe('visit and patient edits that would make the record inconsistent', () => {
  it('refuses an interval of 0 months on a pre-op visit and on a patch to a non-follow-up', async () => {
    const created = await request(app)
      .post(`/api/patients/${patientId}/visits`)
      .set('Cookie', users.fellow.cookie)
      .send({ visitDate: '2026-01-01', visitKind: 'pre-op', monthsSinceSurgery: 0 })
    expect(created.status).toBe(400)
    expect(created.body.error.details.monthsSinceSurgery).toContain(
      'monthsSinceSurgery: applies to follow-up visits only',
    )
    const visitId = await insertTestVisit(db, patientId, users.fellow.id)
    const patched = await request(app)
      .patch(`/api/visits/${visitId}`)
      .set('Cookie', users.fellow.cookie)
      .send({ monthsSinceSurgery: 6, version: 1 })
    expect(patched.status).toBe(400)
    expect((await db(TABLES.visits).where({ id: visitId }).first()).months_since_surgery).toBeNull()
  })

  it("refuses a birth date after the patient's first visit", async () => {
    await insertTestVisit(db, patientId, users.fellow.id, '2000-03-01')
    const res = await request(app)
      .patch(`/api/patients/${patientId}`)
      .set('Cookie', users.fellow.cookie)
      .send({ birthDate: '2001-01-01', version: 1 })
    expect(res.status).toBe(400)
    expect(res.body.error.details.birthDate).toContain('birthDate: cannot be after the first visit')
  })
})

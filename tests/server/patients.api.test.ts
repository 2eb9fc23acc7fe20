import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>

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
})

const valid = {
  recordNumber: 'EPX-0001',
  familyName: 'Tallowmere',
  givenName: 'Brisa',
  birthDate: '1975-02-28',
  sex: 'female',
}

describe('POST /api/patients', () => {
  it('creates a patient with a generated study code and records an audit event', async () => {
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .send(valid)
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      ...valid,
      kind: 'identified',
      version: 1,
      visitCount: 0,
      osteoporosis: false,
    })
    expect(res.body.studyCode).toMatch(/^EP-[2-9A-HJKMNP-Z]{6}$/)
    const stored = await db(TABLES.patients).where({ id: res.body.id }).first()
    expect(stored.family_name).toBe('Tallowmere')
    const events = await db(TABLES.auditEvents).where({
      entity: 'patient',
      entity_id: String(res.body.id),
      action: 'create',
    })
    expect(events).toHaveLength(1)
    expect(events[0].user_id).toBe(users.fellow.id)
  })

  it.each([
    ['recordNumber', { recordNumber: '' }, 'recordNumber: is required'],
    [
      'recordNumber',
      { recordNumber: 'has spaces' },
      'recordNumber: may hold letters, digits, - / and . only',
    ],
    [
      'recordNumber',
      { recordNumber: 'A'.repeat(41) },
      'recordNumber: must be at most 40 characters',
    ],
    ['familyName', { familyName: '  ' }, 'familyName: is required'],
    ['givenName', { givenName: undefined }, 'givenName: is required'],
    ['birthDate', { birthDate: '28/02/1975' }, 'birthDate: must be a date written YYYY-MM-DD'],
    ['birthDate', { birthDate: '1975-02-30' }, 'birthDate: is not a real calendar date'],
    ['birthDate', { birthDate: '2999-01-01' }, 'birthDate: cannot be in the future'],
    ['birthDate', { birthDate: '1850-01-01' }, 'birthDate: must be after 1900'],
    ['sex', { sex: 'x' }, 'sex: must be one of female, male, other, unknown'],
    ['osteoporosis', { osteoporosis: 'yes' }, 'osteoporosis: must be true or false'],
  ])('answers 400 naming %s and stores nothing', async (field, change, message) => {
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .send({ ...valid, ...change })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('validation_failed')
    expect(res.body.error.details[field]).toContain(message)
    expect(await db(TABLES.patients).count({ c: '*' })).toEqual([{ c: 0 }])
  })

  it('refuses fields it does not know', async () => {
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .send({ ...valid, studyCode: 'EP-CHOSEN' })
    expect(res.status).toBe(400)
    expect(JSON.stringify(res.body.error.details)).toMatch(/studyCode/)
  })

  it('answers 409 for a duplicate record number', async () => {
    await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .send(valid)
      .expect(201)
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.surgeon.cookie)
      .send({ ...valid, familyName: 'Other' })
    expect(res.status).toBe(409)
    expect(res.body.error.message).toMatch(/EPX-0001 already exists/)
    expect(await db(TABLES.patients).count({ c: '*' })).toEqual([{ c: 1 }])
  })
})

describe('GET /api/patients', () => {
  beforeEach(async () => {
    const people = [
      ['R-003', 'Abernathy', 'Corin'],
      ['R-001', 'Zellweger', 'Anouk'],
      ['R-002', 'Moreau-Finch', 'Basil'],
    ] as const
    for (const [recordNumber, familyName, givenName] of people) {
      await insertTestPatient(db, users.fellow.id, { recordNumber, familyName, givenName })
    }
  })

  it('pages and sorts on the server and reports the total', async () => {
    const res = await request(app)
      .get('/api/patients?sort=recordNumber&order=desc&limit=2&offset=0')
      .set('Cookie', users.surgeon.cookie)
    expect(res.status).toBe(200)
    expect(res.body.total).toBe(3)
    expect(res.body.items.map((p: { recordNumber: string }) => p.recordNumber)).toEqual([
      'R-003',
      'R-002',
    ])
    const next = await request(app)
      .get('/api/patients?sort=recordNumber&order=desc&limit=2&offset=2')
      .set('Cookie', users.surgeon.cookie)
    expect(next.body.items.map((p: { recordNumber: string }) => p.recordNumber)).toEqual(['R-001'])
    expect(next.body.total).toBe(3)
  })

  it('reports the total on a page past the end, and 0 when nothing matches', async () => {
    const past = await request(app)
      .get('/api/patients?limit=2&offset=10')
      .set('Cookie', users.surgeon.cookie)
    expect(past.status).toBe(200)
    expect(past.body).toEqual({ items: [], total: 3 })
    const none = await request(app)
      .get('/api/patients?q=nobody-by-this-name')
      .set('Cookie', users.surgeon.cookie)
    expect(none.body).toEqual({ items: [], total: 0 })
  })

  it('searches names, record numbers and study codes, ignoring case', async () => {
    const byName = await request(app)
      .get('/api/patients?q=moreau')
      .set('Cookie', users.fellow.cookie)
    expect(byName.body.items.map((p: { familyName: string }) => p.familyName)).toEqual([
      'Moreau-Finch',
    ])
    const byFullName = await request(app)
      .get(`/api/patients?q=${encodeURIComponent('Anouk Zell')}`)
      .set('Cookie', users.fellow.cookie)
    expect(byFullName.body.total).toBe(1)
    const byRecord = await request(app)
      .get('/api/patients?q=R-00')
      .set('Cookie', users.fellow.cookie)
    expect(byRecord.body.total).toBe(3)
    const wildcard = await request(app)
      .get('/api/patients?q=%25')
      .set('Cookie', users.fellow.cookie)
    expect(wildcard.body.total).toBe(0)
  })

  it('writes an audit event for viewing the identified list', async () => {
    await request(app).get('/api/patients?q=Zell').set('Cookie', users.fellow.cookie).expect(200)
    const events = await db(TABLES.auditEvents).where({ entity: 'patient-list', action: 'view' })
    expect(events).toHaveLength(1)
    expect(events[0].summary).toMatch(
      /Viewed 1 of 1 patients for a search of 4 characters \(ids \d+\)/,
    )
  })

  it('keeps names, record numbers and search text out of the audit trail that administrators read', async () => {
    await request(app)
      .get('/api/patients?q=Zellweger')
      .set('Cookie', users.fellow.cookie)
      .expect(200)
    const created = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .send(valid)
    await request(app)
      .get(`/api/patients/${created.body.id}`)
      .set('Cookie', users.surgeon.cookie)
      .expect(200)
    await request(app)
      .post(`/api/patients/${created.body.id}/visits`)
      .set('Cookie', users.fellow.cookie)
      .send({ visitDate: '2026-01-10', visitKind: 'pre-op' })
      .expect(201)
    const trail = await request(app)
      .get('/api/audit-events?limit=200')
      .set('Cookie', users.admin.cookie)
    expect(trail.status).toBe(200)
    const text = JSON.stringify(trail.body)
    for (const secret of [
      'Zellweger',
      'Anouk',
      'R-001',
      'Tallowmere',
      'EPX-0001',
      '1975-02-28',
      '2026-01-10',
    ]) {
      expect(text).not.toContain(secret)
    }
    expect(text).toContain(created.body.studyCode)
  })

  it.each([
    ['sort=birthplace', 'sort'],
    ['order=sideways', 'order'],
    ['limit=0', 'limit'],
    ['limit=500', 'limit'],
    ['offset=-1', 'offset'],
  ])('answers 400 for %s naming the parameter', async (query, field) => {
    const res = await request(app).get(`/api/patients?${query}`).set('Cookie', users.fellow.cookie)
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.details)).toContain(field)
  })
})

describe('GET and PATCH /api/patients/:id', () => {
  it('answers 404 for an unknown id and 400 for one that is not a number', async () => {
    expect(
      (await request(app).get('/api/patients/999999').set('Cookie', users.fellow.cookie)).status,
    ).toBe(404)
    const bad = await request(app).get('/api/patients/abc').set('Cookie', users.fellow.cookie)
    expect(bad.status).toBe(400)
    expect(bad.body.error.details.id).toBeDefined()
  })

  it('audits each view of an identified patient', async () => {
    const id = await insertTestPatient(db, users.fellow.id)
    await request(app).get(`/api/patients/${id}`).set('Cookie', users.surgeon.cookie).expect(200)
    const events = await db(TABLES.auditEvents).where({
      entity: 'patient',
      entity_id: String(id),
      action: 'view',
      user_id: users.surgeon.id,
    })
    expect(events).toHaveLength(1)
  })

  it('updates with the current version and refuses a stale one with 409, changing nothing', async () => {
    const id = await insertTestPatient(db, users.fellow.id)
    const first = await request(app)
      .patch(`/api/patients/${id}`)
      .set('Cookie', users.fellow.cookie)
      .send({ notes: 'first edit', version: 1 })
    expect(first.status).toBe(200)
    expect(first.body.version).toBe(2)
    const stale = await request(app)
      .patch(`/api/patients/${id}`)
      .set('Cookie', users.surgeon.cookie)
      .send({ notes: 'lost edit', version: 1 })
    expect(stale.status).toBe(409)
    expect(stale.body.error.details.version[0]).toMatch(/current version is 2/)
    const stored = await db(TABLES.patients).where({ id }).first()
    expect(stored.notes).toBe('first edit')
  })

  it('requires the version on a patch', async () => {
    const id = await insertTestPatient(db, users.fellow.id)
    const res = await request(app)
      .patch(`/api/patients/${id}`)
      .set('Cookie', users.fellow.cookie)
      .send({ notes: 'x' })
    expect(res.status).toBe(400)
    expect(res.body.error.details.version).toBeDefined()
  })

  it("answers 409 when a patch takes another patient's record number", async () => {
    await insertTestPatient(db, users.fellow.id, { recordNumber: 'TAKEN-1' })
    const id = await insertTestPatient(db, users.fellow.id)
    const res = await request(app)
      .patch(`/api/patients/${id}`)
      .set('Cookie', users.fellow.cookie)
      .send({ recordNumber: 'TAKEN-1', version: 1 })
    expect(res.status).toBe(409)
  })
})

describe('researcher responses', () => {
  it('carry no identifying key or value anywhere', async () => {
    const id = await insertTestPatient(db, users.fellow.id, {
      recordNumber: 'SECRET-77',
      familyName: 'Vandermolen',
      givenName: 'Ysolde',
      birthDate: '1961-07-04',
      studyCode: 'EP-RSRCH1',
    })
    const visitId = await insertTestVisit(db, id, users.fellow.id, '2025-11-20')
    await insertStudyWith(db, users.researcher.id, [id])
    const responses = [
      await request(app).get('/api/patients').set('Cookie', users.researcher.cookie),
      await request(app).get('/api/patients?q=EP-RSRCH').set('Cookie', users.researcher.cookie),
      await request(app).get(`/api/patients/${id}`).set('Cookie', users.researcher.cookie),
      await request(app).get(`/api/patients/${id}/visits`).set('Cookie', users.researcher.cookie),
      await request(app).get(`/api/visits/${visitId}`).set('Cookie', users.researcher.cookie),
    ]
    const forbiddenKeys = [
      'recordNumber',
      'familyName',
      'givenName',
      'birthDate',
      'visitDate',
      'notes',
      'indication',
    ]
    const forbiddenValues = [
      'SECRET-77',
      'Vandermolen',
      'Ysolde',
      '1961-07-04',
      '2025-11-20',
      'Invented test patient',
      'Invented indication text',
    ]
    for (const res of responses) {
      expect(res.status).toBe(200)
      const text = JSON.stringify(res.body)
      for (const key of forbiddenKeys) expect(text).not.toContain(`"${key}"`)
      for (const value of forbiddenValues) expect(text).not.toContain(value)
    }
    for (const res of responses.slice(0, 3)) expect(JSON.stringify(res.body)).toContain('EP-RSRCH1')
    expect(responses[2]!.body).toEqual({
      kind: 'deidentified',
      id,
      studyCode: 'EP-RSRCH1',
      sex: 'female',
      ageAtFirstVisitYears: 64,
      visitCount: 1,
    })
    expect(responses[3]!.body[0]).toMatchObject({ sequence: 1, ageAtVisitYears: 64 })
  })

  it('cannot find a patient by name or record number', async () => {
    const id = await insertTestPatient(db, users.fellow.id, {
      recordNumber: 'PROBE-1',
      familyName: 'Findable',
    })
    await insertStudyWith(db, users.researcher.id, [id])
    for (const q of ['Findable', 'PROBE-1']) {
      const res = await request(app)
        .get(`/api/patients?q=${q}`)
        .set('Cookie', users.researcher.cookie)
      expect(res.body.total).toBe(0)
    }
  })
})

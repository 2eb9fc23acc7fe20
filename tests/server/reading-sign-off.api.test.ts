import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { APP_VERSION } from '../../server/version'
import type { Role } from '../../shared/types/domain'
import type { Reading } from '../../shared/types/readings'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  type TestUser,
} from '../support/test-app'
import {
  insertStudyWith,
  insertTestFilm,
  insertTestPatient,
  insertTestVisit,
  SLIP_25_PERCENT_POINTS,
} from '../support/fixtures'

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let patientId: number
let visitId: number
let imageId: number

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
  patientId = await insertTestPatient(db, users.fellow.id, {
    familyName: 'Quillfeather',
    givenName: 'Odalys',
  })
  visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-02')
  imageId = await insertTestFilm(db, visitId, users.fellow.id)
  await insertStudyWith(db, users.researcher.id, [patientId])
})

const as = (who: TestUser) => ({
  get: (path: string) => request(app).get(path).set('Cookie', who.cookie),
  post: (path: string, body: object = {}) =>
    request(app).post(path).set('Cookie', who.cookie).send(body),
  patch: (path: string, body: object) =>
    request(app).patch(path).set('Cookie', who.cookie).send(body),
})

/** A slip-grade reading by `who` with every landmark placed, submitted unless asked not to. */
async function reading(who: TestUser = users.fellow, submit = true): Promise<Reading> {
  const created = await as(who).post(`/api/images/${imageId}/readings`, {
    template: 'slip-grade',
    options: { segment: 'L5-S1' },
    points: SLIP_25_PERCENT_POINTS,
  })
  expect(created.status).toBe(201)
  if (!submit) return created.body
  const submitted = await as(who).post(`/api/readings/${created.body.id}/submit`, {
    version: created.body.version,
  })
  expect(submitted.status).toBe(200)
  return submitted.body
}

async function signed(byWho: TestUser = users.surgeon): Promise<Reading> {
  const submitted = await reading()
  const res = await as(byWho).post(`/api/readings/${submitted.id}/sign`, {
    version: submitted.version,
  })
  expect(res.status).toBe(200)
  return res.body
}

const auditOf = (action: string) => db(TABLES.auditEvents).where({ action }).orderBy('id')

describe('POST /api/readings/:id/sign', () => {
  it('signs a submitted reading, recomputing it with the settings in force and the engine version', async () => {
    const submitted = await reading()
    expect(submitted.results.computedWith?.landmarkSigmaMm).toBe(1)
    // The site changes σ between submission and signature: the signed results follow.
    await db(TABLES.siteSettings).insert({ key: 'landmarkSigmaMm', value: JSON.stringify(2) })
    const res = await as(users.surgeon).post(`/api/readings/${submitted.id}/sign`, {
      version: submitted.version,
    })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({
      status: 'signed',
      signedBy: users.surgeon.id,
      signedByName: 'Test surgeon',
      version: submitted.version + 1,
      engineVersion: APP_VERSION,
    })
    expect(Date.parse(res.body.signedAt)).not.toBeNaN()
    expect(res.body.results.uncertainty.sigma).toEqual({ value: 2, unit: 'mm' })
    expect(res.body.results.computedWith.landmarkSigmaMm).toBe(2)
    // Taillard 25 % (Butt & Saifuddin 2005): the landmarks themselves are unchanged.
    expect(res.body.results.measurements.segments['L5-S1'].slipPercent).toBeCloseTo(25, 9)
    const [event] = await auditOf('sign')
    expect(event).toMatchObject({ entity: 'reading', entity_id: String(submitted.id) })
    expect(event.user_id).toBe(users.surgeon.id)
  })

  it('never changes a signed reading: edits, submits, signatures, returns and film deletion answer 409', async () => {
    const done = await signed()
    const expectations = [
      await as(users.fellow).patch(`/api/readings/${done.id}`, {
        points: {},
        version: done.version,
      }),
      await as(users.fellow).post(`/api/readings/${done.id}/submit`, { version: done.version }),
      await as(users.surgeon).post(`/api/readings/${done.id}/sign`, { version: done.version }),
      await as(users.surgeon).post(`/api/readings/${done.id}/return`, {
        version: done.version,
        comment: 'Too late',
      }),
    ]
    for (const res of expectations) {
      expect(res.status).toBe(409)
      expect(res.body.error.message).toMatch(/signed.*start an amendment/)
    }
    const deletion = await request(app)
      .delete(`/api/images/${imageId}`)
      .set('Cookie', users.fellow.cookie)
    expect(deletion.status).toBe(409)
    const row = await db(TABLES.readings).where({ id: done.id }).first()
    expect(row.status).toBe('signed')
    expect(row.version).toBe(done.version)
  })

  it("refuses a surgeon's signature on their own reading and anyone's who is not a surgeon", async () => {
    const own = await reading(users.surgeon)
    const self = await as(users.surgeon).post(`/api/readings/${own.id}/sign`, {
      version: own.version,
    })
    expect(self.status).toBe(403)
    expect(self.body.error.message).toMatch(/another surgeon/)
    const other = await reading()
    for (const who of [users.fellow, users.researcher, users.admin]) {
      expect(
        (await as(who).post(`/api/readings/${other.id}/sign`, { version: other.version })).status,
      ).toBe(403)
    }
    expect(await auditOf('sign')).toHaveLength(0)
  })

  it('answers a stale version with 409 and the reading as it now stands', async () => {
    const submitted = await reading()
    const res = await as(users.surgeon).post(`/api/readings/${submitted.id}/sign`, {
      version: submitted.version - 1,
    })
    expect(res.status).toBe(409)
    expect(res.body.error.message).toMatch(/Nothing was signed/)
    expect(res.body.current).toMatchObject({ id: submitted.id, version: submitted.version })
    expect((await db(TABLES.readings).where({ id: submitted.id }).first()).status).toBe('submitted')
  })
})

describe('POST /api/readings/:id/return', () => {
  it.each([
    ['no comment', {}, /comment saying what to change is required/],
    ['a blank comment', { comment: '   ' }, /comment saying what to change is required/],
    ['a comment of 2001 characters', { comment: 'x'.repeat(2001) }, /at most 2000 characters/],
  ])('refuses %s and keeps the reading submitted', async (_label, body, message) => {
    const submitted = await reading()
    const res = await as(users.surgeon).post(`/api/readings/${submitted.id}/return`, {
      version: submitted.version,
      ...body,
    })
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(message)
    expect((await db(TABLES.readings).where({ id: submitted.id }).first()).status).toBe('submitted')
  })

  it('returns it to the rater with the comment, who edits and submits it again', async () => {
    const submitted = await reading()
    const comment = 'L5 anterior-inferior corner sits on an osteophyte; place it on the cortex.'
    const res = await as(users.surgeon).post(`/api/readings/${submitted.id}/return`, {
      version: submitted.version,
      comment,
    })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({
      status: 'returned',
      returnComment: comment,
      returnedBy: users.surgeon.id,
      returnedByName: 'Test surgeon',
    })
    const thread = await as(users.fellow).get(`/api/readings/${submitted.id}/comments`)
    expect(thread.body).toEqual([
      expect.objectContaining({ kind: 'return', text: comment, authorId: users.surgeon.id }),
    ])
    // The free text stays out of the audit trail (it may name the patient).
    const [event] = await auditOf('return')
    expect(event.summary).not.toContain('osteophyte')

    const moved = { ...SLIP_25_PERCENT_POINTS, 'L5.ai': [91, 90] }
    const edited = await as(users.fellow).patch(`/api/readings/${submitted.id}`, {
      points: moved,
      version: res.body.version,
    })
    expect(edited.status).toBe(200)
    expect(edited.body.status).toBe('returned')
    const again = await as(users.fellow).post(`/api/readings/${submitted.id}/submit`, {
      version: edited.body.version,
    })
    expect(again.status).toBe(200)
    expect(again.body.status).toBe('submitted')
    // The comment stays on the reading for the surgeon who looks at it again.
    expect(again.body.returnComment).toBe(comment)
    expect((await auditOf('submit')).map((e) => e.summary).join('\n')).toMatch(/again/)
  })
})

describe('POST /api/readings/:id/amendments', () => {
  it('starts a draft with the same landmarks that supersedes the original once signed', async () => {
    const original = await signed()
    const reason = 'Calibration sphere re-measured; the original used the detector spacing.'
    const res = await as(users.fellow).post(`/api/readings/${original.id}/amendments`, { reason })
    expect(res.status).toBe(201)
    const amendment: Reading = res.body
    expect(amendment).toMatchObject({
      status: 'draft',
      raterId: users.fellow.id,
      supersedesId: original.id,
      supersedeReason: reason,
      template: 'slip-grade',
    })
    expect(amendment.landmarks.points).toEqual(original.landmarks.points)
    // Until the amendment is signed, the original stays the record, marked as being amended.
    const during = await as(users.surgeon).get(`/api/readings/${original.id}`)
    expect(during.body).toMatchObject({ status: 'signed', supersededById: amendment.id })

    const second = await as(users.surgeon).post(`/api/readings/${original.id}/amendments`, {
      reason: 'Another try',
    })
    expect(second.status).toBe(409)
    expect(second.body.error.message).toMatch(new RegExp(`Reading ${amendment.id} already amends`))

    const submitted = await as(users.fellow).post(`/api/readings/${amendment.id}/submit`, {
      version: amendment.version,
    })
    expect(submitted.status).toBe(200)
    const signedAmendment = await as(users.surgeon).post(`/api/readings/${amendment.id}/sign`, {
      version: submitted.body.version,
    })
    expect(signedAmendment.status).toBe(200)
    const after = await as(users.fellow).get(`/api/readings/${original.id}`)
    expect(after.body).toMatchObject({ status: 'superseded', supersededById: amendment.id })
    expect((await auditOf('amend'))[0].entity_id).toBe(String(amendment.id))
    expect((await auditOf('update')).map((e) => e.summary)).toContain(
      `Reading ${original.id} superseded by signed amendment ${amendment.id}`,
    )
    // A superseded reading cannot be amended again; its amendment can.
    const late = await as(users.fellow).post(`/api/readings/${original.id}/amendments`, {
      reason: 'Again',
    })
    expect(late.status).toBe(409)
    expect(late.body.error.message).toMatch(/replaced by an amendment/)
  })

  it('refuses an amendment of a reading that is not signed, without a reason, or by researchers', async () => {
    const draft = await reading(users.fellow, false)
    const notSigned = await as(users.fellow).post(`/api/readings/${draft.id}/amendments`, {
      reason: 'Fix',
    })
    expect(notSigned.status).toBe(409)
    expect(notSigned.body.error.message).toMatch(/Only a signed reading is amended/)
    const done = await signed()
    expect(
      (await as(users.fellow).post(`/api/readings/${done.id}/amendments`, { reason: ' ' })).status,
    ).toBe(400)
    expect(
      (await as(users.researcher).post(`/api/readings/${done.id}/amendments`, { reason: 'x' }))
        .status,
    ).toBe(403)
    expect(await db(TABLES.readings).whereNotNull('supersedes_id')).toHaveLength(0)
  })
})

describe('GET /api/readings', () => {
  it("lists the readings awaiting a surgeon: the patient's own surgeon's, or everyone's when none is set", async () => {
    const other = await createTestUser(db, config, 'surgeon', 'second.surgeon@test.example')
    const unassigned = await reading()
    const patched = await as(users.fellow).patch(`/api/patients/${patientId}`, {
      responsibleSurgeonId: other.id,
      version: 1,
    })
    expect(patched.status).toBe(200)
    expect(patched.body.responsibleSurgeonName).toBe('Test surgeon')
    const assigned = await reading()
    expect(assigned.reviewerId).toBe(other.id)
    const own = await reading(users.surgeon)

    const mine = await as(users.surgeon).get('/api/readings?awaiting=me&sort=submittedAt&order=asc')
    expect(mine.status).toBe(200)
    expect(mine.body.items.map((item: Reading) => item.id)).toEqual([unassigned.id])
    const theirs = await as(other).get('/api/readings?awaiting=me&sort=submittedAt&order=asc')
    // Oldest request first; the other surgeon's own reading waits for this one as well.
    expect(theirs.body.items.map((item: Reading) => item.id)).toEqual([
      unassigned.id,
      assigned.id,
      own.id,
    ])
    expect(theirs.body.total).toBe(3)
    expect(theirs.body.items[0]).toMatchObject({
      patientName: 'Quillfeather, Odalys',
      studyCode: expect.any(String),
      visitKind: 'pre-op',
      visitDate: '2026-03-02',
      raterName: 'Test fellow',
      template: 'slip-grade',
    })
  })

  it('filters by rater and status, pages, and refuses a bad filter', async () => {
    const first = await reading(users.fellow, false)
    await reading(users.fellow, false)
    await reading(users.surgeon, false)
    const page = await as(users.fellow).get(
      '/api/readings?rater=me&status=draft,returned&sort=id&order=asc&limit=1&offset=1',
    )
    expect(page.status).toBe(200)
    expect(page.body.total).toBe(2)
    expect(page.body.items).toHaveLength(1)
    expect(page.body.items[0].id).toBe(first.id + 1)
    for (const query of ['status=finished', 'rater=someone', 'limit=500', 'sort=name']) {
      const res = await as(users.fellow).get(`/api/readings?${query}`)
      expect(res.status).toBe(400)
    }
  })

  it('gives researchers de-identified rows of their studies only, without dates or free text', async () => {
    const submitted = await reading()
    await as(users.surgeon).post(`/api/readings/${submitted.id}/return`, {
      version: submitted.version,
      comment: 'Quillfeather film: redo the corners',
    })
    const outsider = await insertTestPatient(db, users.fellow.id)
    const outsideVisit = await insertTestVisit(db, outsider, users.fellow.id)
    imageId = await insertTestFilm(db, outsideVisit, users.fellow.id)
    await reading()
    const res = await as(users.researcher).get('/api/readings')
    expect(res.status).toBe(200)
    expect(res.body.total).toBe(1)
    const [row] = res.body.items
    expect(row).toMatchObject({
      id: submitted.id,
      patientName: null,
      recordNumber: null,
      visitDate: null,
      submittedAt: null,
      returnedAt: null,
      returnComment: null,
      createdAt: null,
      updatedAt: null,
    })
    expect(JSON.stringify(res.body)).not.toMatch(/Quillfeather|Odalys|2026-03-02/)
    expect((await as(users.admin).get('/api/readings')).status).toBe(403)
  })

  it('leaves out readings of films held back for their pixels, which a researcher cannot open', async () => {
    const released = await reading()
    imageId = await insertTestFilm(db, visitId, users.fellow.id, 'unknown')
    const heldBack = await reading()
    const listed = await as(users.researcher).get('/api/readings')
    expect(listed.body).toMatchObject({ total: 1, items: [{ id: released.id }] })
    expect((await as(users.researcher).get(`/api/readings/${heldBack.id}`)).status).toBe(404)
    // Clinicians list both; once a clinician clears the film, so does the researcher.
    expect((await as(users.surgeon).get('/api/readings')).body.total).toBe(2)
    await db(TABLES.images).where({ id: imageId }).update({ pixels_cleared_at: new Date() })
    expect((await as(users.researcher).get('/api/readings')).body.total).toBe(2)
  })
})

describe('/api/readings/:id/comments', () => {
  it('keeps a thread with author and time for clinicians; researchers and administrators see none', async () => {
    const submitted = await reading()
    const posted = await as(users.surgeon).post(`/api/readings/${submitted.id}/comments`, {
      text: 'Is the S1 endplate double-contoured here?',
    })
    expect(posted.status).toBe(201)
    expect(posted.body).toMatchObject({
      readingId: submitted.id,
      authorId: users.surgeon.id,
      authorName: 'Test surgeon',
      kind: 'comment',
    })
    expect(Date.parse(posted.body.createdAt)).not.toBeNaN()
    const answer = await as(users.fellow).post(`/api/readings/${submitted.id}/comments`, {
      text: 'Yes: I took the midpoint of the two contours.',
    })
    expect(answer.status).toBe(201)
    const thread = await as(users.fellow).get(`/api/readings/${submitted.id}/comments`)
    expect(thread.body.map((entry: { authorName: string }) => entry.authorName)).toEqual([
      'Test surgeon',
      'Test fellow',
    ])
    for (const who of [users.researcher, users.admin]) {
      expect((await as(who).get(`/api/readings/${submitted.id}/comments`)).status).toBe(403)
      expect(
        (await as(who).post(`/api/readings/${submitted.id}/comments`, { text: 'x' })).status,
      ).toBe(403)
    }
    expect(await auditOf('comment')).toHaveLength(2)
  })

  it.each([
    ['no text', {}],
    ['empty text', { text: '' }],
    ['2001 characters', { text: 'y'.repeat(2001) }],
    ['an unknown field', { text: 'ok', extra: 1 }],
  ])('refuses a comment with %s (400) and stores nothing', async (_label, body) => {
    const submitted = await reading()
    const res = await as(users.fellow).post(`/api/readings/${submitted.id}/comments`, body)
    expect(res.status).toBe(400)
    expect(await db(TABLES.comments)).toHaveLength(0)
  })

  it('answers 404 for a reading outside what the actor may see', async () => {
    const res = await as(users.fellow).get('/api/readings/999999/comments')
    expect(res.status).toBe(404)
  })
})

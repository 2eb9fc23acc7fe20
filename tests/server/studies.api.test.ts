import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  type TestUser,
} from '../support/test-app'
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

const as = (user: TestUser) => ({
  get: (path: string) => request(app).get(path).set('Cookie', user.cookie),
  post: (path: string, body: object) =>
    request(app).post(path).set('Cookie', user.cookie).send(body),
  patch: (path: string, body: object) =>
    request(app).patch(path).set('Cookie', user.cookie).send(body),
  put: (path: string, body: object) => request(app).put(path).set('Cookie', user.cookie).send(body),
})

async function auditEvents(entity: string, entityId: number) {
  return db(TABLES.auditEvents)
    .where({ entity, entity_id: String(entityId) })
    .orderBy('id')
}

describe('POST /api/studies', () => {
  it('creates a study for a surgeon, audits it, and answers it with version 1', async () => {
    const res = await as(users.surgeon).post('/api/studies', {
      name: 'Disc replacement follow-up',
      description: 'Two-year alignment after disc replacement',
      note: 'Invented study for tests',
    })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      name: 'Disc replacement follow-up',
      note: 'Invented study for tests',
      version: 1,
      patientCount: 0,
      filmCount: 0,
      readingCount: 0,
      members: [],
      patientIds: [],
    })
    const events = await auditEvents('study', res.body.id)
    expect(events.map((event) => event.action)).toEqual(['create'])
    expect(events[0].user_id).toBe(users.surgeon.id)
  })

  it('refuses a blank name with 400 and a duplicate name with 409, storing nothing more', async () => {
    const blank = await as(users.admin).post('/api/studies', { name: '  ' })
    expect(blank.status).toBe(400)
    expect(blank.body.error.details.name).toEqual(['name: is required'])
    await as(users.admin).post('/api/studies', { name: 'Cohort A' })
    const duplicate = await as(users.surgeon).post('/api/studies', { name: 'Cohort A' })
    expect(duplicate.status).toBe(409)
    expect(await db(TABLES.studies).count({ n: '*' })).toEqual([{ n: 1 }])
  })

  it('refuses researchers and fellows (403)', async () => {
    for (const who of [users.researcher, users.fellow]) {
      const res = await as(who).post('/api/studies', { name: `By ${who.role}` })
      expect(res.status).toBe(403)
    }
  })
})

describe('GET /api/studies', () => {
  it('shows a researcher only the studies they belong to, with counts of patients, films and readings', async () => {
    const patient = await insertTestPatient(db, users.fellow.id)
    const other = await insertTestPatient(db, users.fellow.id)
    const visit = await insertTestVisit(db, patient, users.fellow.id)
    const mine = await insertStudyWith(db, users.researcher.id, [patient, other])
    const stranger = await createTestUser(db, config, 'researcher', 'stranger@test.example')
    await insertStudyWith(db, stranger.id, [other])
    const [imageId] = await db(TABLES.images).insert({
      visit_id: visit,
      view: 'lateral-neutral',
      file_kind: 'png',
      content_hash: 'a'.repeat(64),
      original_path: 'x/original.png',
      display_path: 'x/display.png',
      preview_path: 'x/preview.png',
      thumbnail_path: 'x/thumbnail.png',
      full_depth_path: 'x/full.png',
      original_name: 'x.png',
      size_bytes: 1,
      width: 10,
      height: 10,
      bits_stored: 8,
      spacing_source: 'none',
      // Released to researchers, so it counts for them (held-back films: pixel-review tests).
      burned_in_annotation: 'no',
      uploaded_by: users.fellow.id,
    })
    const reading = {
      image_id: imageId,
      rater_id: users.fellow.id,
      template: 'slip-grade',
      landmarks: JSON.stringify({ points: {} }),
      results: JSON.stringify({}),
      engine_version: 'test',
    }
    await db(TABLES.readings).insert([reading, { ...reading, blinded: true }])

    const res = await as(users.researcher).get('/api/studies')
    expect(res.status).toBe(200)
    expect(res.body.total).toBe(1)
    // The blinded round reading stays out of the count.
    expect(res.body.items).toEqual([
      expect.objectContaining({
        id: mine,
        patientCount: 2,
        filmCount: 1,
        heldBackFilmCount: 0,
        readingCount: 1,
        memberCount: 1,
      }),
    ])
    const all = await as(users.surgeon).get('/api/studies')
    expect(all.body.total).toBe(2)
  })

  it('pages by limit and offset and searches names', async () => {
    for (const name of ['Alpha cohort', 'Beta cohort', 'Gamma group']) {
      await as(users.surgeon).post('/api/studies', { name })
    }
    const page = await as(users.surgeon).get('/api/studies?limit=2&offset=1')
    expect(page.body.total).toBe(3)
    expect(page.body.items.map((s: { name: string }) => s.name)).toEqual([
      'Beta cohort',
      'Gamma group',
    ])
    const search = await as(users.surgeon).get('/api/studies?q=cohort')
    expect(search.body.total).toBe(2)
    const bad = await as(users.surgeon).get('/api/studies?limit=500')
    expect(bad.status).toBe(400)
    expect(bad.body.error.details.limit).toEqual(['limit: must be at most 100'])
  })
})

describe('GET /api/studies/:id', () => {
  it('answers 404 to a researcher outside the study, as if it did not exist', async () => {
    const stranger = await createTestUser(db, config, 'researcher', 'stranger@test.example')
    const theirs = await insertStudyWith(db, stranger.id, [])
    expect((await as(users.researcher).get(`/api/studies/${theirs}`)).status).toBe(404)
    expect((await as(users.researcher).get(`/api/studies/${theirs}/patients`)).status).toBe(404)
    expect((await as(stranger).get(`/api/studies/${theirs}`)).status).toBe(200)
  })

  it("lists a study's patients de-identified for its researcher and identified for a surgeon", async () => {
    const patient = await insertTestPatient(db, users.fellow.id, { familyName: 'Vantrelle' })
    await insertTestVisit(db, patient, users.fellow.id, '2026-02-01')
    const study = await insertStudyWith(db, users.researcher.id, [patient])
    const researcher = await as(users.researcher).get(`/api/studies/${study}/patients`)
    expect(researcher.status).toBe(200)
    expect(researcher.body.total).toBe(1)
    expect(Object.keys(researcher.body.items[0]).sort()).toEqual(
      ['ageAtFirstVisitYears', 'id', 'kind', 'sex', 'studyCode', 'visitCount'].sort(),
    )
    expect(JSON.stringify(researcher.body)).not.toMatch(/Vantrelle|TST-|1970-05-17|2026-02-01/)
    const surgeon = await as(users.surgeon).get(`/api/studies/${study}/patients`)
    expect(surgeon.body.items[0]).toMatchObject({ kind: 'identified', familyName: 'Vantrelle' })
    const views = await db(TABLES.auditEvents).where({ action: 'view', entity: 'patient-list' })
    expect(views).toHaveLength(1)
    expect(views[0].summary).toContain(`of study ${study}`)
  })
})

describe('PATCH /api/studies/:id', () => {
  it('edits with the current version, bumps it, audits the fields, and answers 409 to a stale one', async () => {
    const created = await as(users.surgeon).post('/api/studies', { name: 'Cohort B' })
    const id = created.body.id
    const first = await as(users.admin).patch(`/api/studies/${id}`, {
      note: 'Recruiting',
      version: 1,
    })
    expect(first.status).toBe(200)
    expect(first.body).toMatchObject({ note: 'Recruiting', version: 2 })
    const stale = await as(users.surgeon).patch(`/api/studies/${id}`, { name: 'Lost', version: 1 })
    expect(stale.status).toBe(409)
    expect(stale.body.error.details.version).toEqual(['version: current version is 2'])
    expect((await db(TABLES.studies).where({ id }).first()).name).toBe('Cohort B')
    const events = await auditEvents('study', id)
    expect(events.map((event) => event.summary)).toEqual([
      `Created study ${id}`,
      `Updated study ${id}: note`,
    ])
  })

  it('refuses an unknown field with 400', async () => {
    const created = await as(users.surgeon).post('/api/studies', { name: 'Cohort C' })
    const res = await as(users.surgeon).patch(`/api/studies/${created.body.id}`, {
      owner: 3,
      version: 1,
    })
    expect(res.status).toBe(400)
  })
})

describe('PUT /api/studies/:id/patients and /members', () => {
  it('replaces the patients, counts what changed, and refuses unknown ids or a stale version', async () => {
    const created = await as(users.surgeon).post('/api/studies', { name: 'Cohort D' })
    const id = created.body.id
    const [a, b, c] = [
      await insertTestPatient(db, users.fellow.id),
      await insertTestPatient(db, users.fellow.id),
      await insertTestPatient(db, users.fellow.id),
    ]
    const first = await as(users.surgeon).put(`/api/studies/${id}/patients`, {
      patientIds: [a, b, b],
      version: 1,
    })
    expect(first.status).toBe(200)
    expect(first.body).toMatchObject({ patientCount: 2, version: 2 })
    const second = await as(users.admin).put(`/api/studies/${id}/patients`, {
      patientIds: [b, c],
      version: 2,
    })
    expect(second.body).toMatchObject({ patientCount: 2, version: 3, patientIds: [b, c] })
    const stored = await db(TABLES.studyPatients).where({ study_id: id }).orderBy('patient_id')
    expect(stored.map((row) => row.patient_id)).toEqual([b, c])
    const unknown = await as(users.surgeon).put(`/api/studies/${id}/patients`, {
      patientIds: [c, 999999],
      version: 3,
    })
    expect(unknown.status).toBe(400)
    expect(unknown.body.error.message).toMatch(/no patient with id 999999/)
    const stale = await as(users.surgeon).put(`/api/studies/${id}/patients`, {
      patientIds: [],
      version: 2,
    })
    expect(stale.status).toBe(409)
    expect(await db(TABLES.studyPatients).where({ study_id: id })).toHaveLength(2)
    const summaries = (await auditEvents('study', id)).map((event) => event.summary)
    expect(summaries).toContain(`Set the patients of study ${id}: 2 (2 added, 0 removed)`)
    expect(summaries).toContain(`Set the patients of study ${id}: 2 (1 added, 1 removed)`)
  })

  it('makes researchers members (who then see the study) and refuses other roles as members', async () => {
    const created = await as(users.surgeon).post('/api/studies', { name: 'Cohort E' })
    const id = created.body.id
    expect((await as(users.researcher).get(`/api/studies/${id}`)).status).toBe(404)
    const refused = await as(users.surgeon).put(`/api/studies/${id}/members`, {
      userIds: [users.fellow.id],
      version: 1,
    })
    expect(refused.status).toBe(400)
    expect(refused.body.error.message).toMatch(/is not a researcher account/)
    const res = await as(users.surgeon).put(`/api/studies/${id}/members`, {
      userIds: [users.researcher.id],
      version: 1,
    })
    expect(res.status).toBe(200)
    expect(res.body.members).toEqual([
      expect.objectContaining({ id: users.researcher.id, displayName: 'Test researcher' }),
    ])
    const seen = await as(users.researcher).get(`/api/studies/${id}`)
    expect(seen.status).toBe(200)
    const members = await as(users.researcher).get(`/api/studies/${id}/members`)
    expect(members.body).toMatchObject({ total: 1 })
  })

  it('lets an administrator find patients to add by study code only, de-identified', async () => {
    await insertTestPatient(db, users.fellow.id, { familyName: 'Ormsgate', studyCode: 'EP-ABC234' })
    const byName = await as(users.admin).get('/api/studies/patient-candidates?q=Ormsgate')
    expect(byName.body.total).toBe(0)
    const byCode = await as(users.admin).get('/api/studies/patient-candidates?q=ABC2')
    expect(byCode.body.items).toEqual([
      expect.objectContaining({ kind: 'deidentified', studyCode: 'EP-ABC234' }),
    ])
    expect(JSON.stringify(byCode.body)).not.toMatch(/Ormsgate/)
    const researchers = await as(users.admin).get('/api/studies/member-candidates')
    expect(researchers.body.items.map((u: { id: number }) => u.id)).toEqual([users.researcher.id])
  })
})

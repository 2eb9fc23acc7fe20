import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { DEFAULT_SIGMA_MM } from '../../shared/measurement/uncertainty'
import { DEFAULT_SUBSIDENCE_THRESHOLD_MM } from '../../shared/measurement/subsidence'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import {
  insertTestFilm,
  insertTestPatient,
  insertTestVisit,
  SLIP_25_PERCENT_POINTS,
} from '../support/fixtures'

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

const put = (who: TestUser, body: object) =>
  request(app).put('/api/settings').set('Cookie', who.cookie).send(body)

describe('GET /api/settings', () => {
  it("answers the engine's defaults to every signed-in role before anything is saved", async () => {
    for (const who of Object.values(users)) {
      const res = await request(app).get('/api/settings').set('Cookie', who.cookie)
      expect(res.status).toBe(200)
      expect(res.body).toEqual({
        values: {
          landmarkSigmaMm: DEFAULT_SIGMA_MM,
          subsidenceThresholdMm: DEFAULT_SUBSIDENCE_THRESHOLD_MM,
          instabilityCriterion: 'white-panjabi-1990',
          // measurement-reference §11 (McAfee et al. 2005, from memory).
          implantCentringThresholdMm: 3,
          invitationLifetimeHours: 72,
        },
        version: 0,
        updatedAt: null,
        updatedByName: null,
      })
    }
    expect((await request(app).get('/api/settings')).status).toBe(401)
  })

  it('falls back to the default for a stored value outside the bounds', async () => {
    await db(TABLES.siteSettings).insert({ key: 'landmarkSigmaMm', value: JSON.stringify(-3) })
    const res = await request(app).get('/api/settings').set('Cookie', users.fellow.cookie)
    expect(res.body.values.landmarkSigmaMm).toBe(DEFAULT_SIGMA_MM)
  })
})

describe('PUT /api/settings', () => {
  it('saves what an administrator changed, audited, and the server computes readings with it', async () => {
    const res = await put(users.admin, {
      values: {
        landmarkSigmaMm: 1.5,
        instabilityCriterion: 'dupuis-1985',
        subsidenceThresholdMm: 2,
      },
      version: 0,
    })
    expect(res.status).toBe(200)
    expect(res.body.values).toMatchObject({
      landmarkSigmaMm: 1.5,
      instabilityCriterion: 'dupuis-1985',
    })
    // Only the settings that changed are written (2 mm was already the subsidence threshold).
    expect(res.body.version).toBe(2)
    expect(res.body.updatedByName).toBe('Test admin')
    const [event] = await db(TABLES.auditEvents).where({ entity: 'site-settings' })
    expect(event.summary).toBe(
      'Changed landmarkSigmaMm 1 mm → 1.5 mm; instabilityCriterion white-panjabi-1990 → dupuis-1985',
    )

    const patientId = await insertTestPatient(db, users.fellow.id)
    const visitId = await insertTestVisit(db, patientId, users.fellow.id)
    const imageId = await insertTestFilm(db, visitId, users.fellow.id)
    const reading = await request(app)
      .post(`/api/images/${imageId}/readings`)
      .set('Cookie', users.fellow.cookie)
      .send({
        template: 'slip-grade',
        options: { segment: 'L5-S1' },
        points: SLIP_25_PERCENT_POINTS,
      })
    expect(reading.body.results.uncertainty.sigma).toEqual({ value: 1.5, unit: 'mm' })
    expect(reading.body.results.computedWith).toEqual({
      landmarkSigmaMm: 1.5,
      subsidenceThresholdMm: 2,
      instabilityCriterion: 'dupuis-1985',
      implantCentringThresholdMm: 3,
    })
  })

  it.each([
    ['σ of 0 mm', { landmarkSigmaMm: 0 }, /between 0\.1 and 5 mm/],
    ['σ as text', { landmarkSigmaMm: '1' }, /must be a number of mm/],
    ['a fractional lifetime', { invitationLifetimeHours: 1.5 }, /whole number of h/],
    ['an unknown criterion', { instabilityCriterion: 'any' }, /one of white-panjabi-1990/],
    ['an unknown setting', { sessionColour: 'blue' }, /sessionColour/],
  ])('refuses %s with 400 and saves nothing', async (_label, values, message) => {
    const res = await put(users.admin, { values, version: 0 })
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(message)
    expect(await db(TABLES.siteSettings)).toHaveLength(0)
  })

  it('answers 409 with the current settings when they changed since they were read', async () => {
    expect((await put(users.admin, { values: { landmarkSigmaMm: 2 }, version: 0 })).status).toBe(
      200,
    )
    const stale = await put(users.admin, { values: { landmarkSigmaMm: 3 }, version: 0 })
    expect(stale.status).toBe(409)
    expect(stale.body.current.values.landmarkSigmaMm).toBe(2)
    expect(stale.body.current.version).toBe(1)
  })

  it('is for administrators only', async () => {
    for (const who of [users.surgeon, users.fellow, users.researcher]) {
      expect((await put(who, { values: { landmarkSigmaMm: 2 }, version: 0 })).status).toBe(403)
    }
    expect(await db(TABLES.siteSettings)).toHaveLength(0)
  })
})

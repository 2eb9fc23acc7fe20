import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { effectScope, ref } from 'vue'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import type { Role } from '../../shared/types/domain'
import type { ImageRecord } from '../../shared/types/api'
import type { Reading } from '../../shared/types/readings'
import type { SiteSettings } from '../../shared/settings/site-settings'
import {
  filmAsComputed,
  resultSettingsInForce,
  useLiveResults,
} from '../../src/composables/use-live-results'
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

const get = async <T>(who: TestUser, path: string): Promise<T> => {
  const res = await request(app).get(path).set('Cookie', who.cookie)
  expect(res.status).toBe(200)
  return res.body as T
}

/**
 * The workspace's live results (the client composable, fed what the client fetches: the site
 * settings, the film and the reading) against the results the server saved for the same
 * landmarks. The server's are the record; the live ones must not say anything else.
 */
describe('live and saved results', () => {
  it('agree on the intervals of one reading under a site σ other than the default', async () => {
    const saved = await request(app)
      .put('/api/settings')
      .set('Cookie', users.admin.cookie)
      .send({ values: { landmarkSigmaMm: 1.7 }, version: 0 })
    expect(saved.status).toBe(200)
    const patientId = await insertTestPatient(db, users.fellow.id)
    const visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-02')
    const imageId = await insertTestFilm(db, visitId, users.fellow.id)
    const created = await request(app)
      .post(`/api/images/${imageId}/readings`)
      .set('Cookie', users.fellow.cookie)
      .send({
        template: 'slip-grade',
        options: { segment: 'L5-S1' },
        points: SLIP_25_PERCENT_POINTS,
      })
    expect(created.status).toBe(201)

    const settings = await get<SiteSettings>(users.fellow, '/api/settings')
    const reading = await get<Reading>(users.fellow, `/api/readings/${created.body.id}`)
    const film = await get<ImageRecord>(users.fellow, `/api/images/${imageId}`)
    const inForce = resultSettingsInForce(settings.values, reading)
    expect(inForce.landmarkSigmaMm).toBe(1.7)

    const scope = effectScope()
    const live = scope.run(() =>
      useLiveResults(
        ref(reading.landmarks.points),
        ref(filmAsComputed(film, reading, reading.calibration)),
        ref(false),
        ref(inForce.landmarkSigmaMm),
      ),
    )!
    const uncertainty = live.results.value.uncertainty
    scope.stop()
    expect(reading.results.uncertainty?.sigma).toEqual({ value: 1.7, unit: 'mm' })
    expect(uncertainty).toEqual(reading.results.uncertainty)
    expect(live.results.value.measurements).toEqual(reading.results.measurements)
    // One interval spelled out, so the comparison is not of two empty objects.
    const slip = uncertainty?.measurements.segments['L5-S1']?.slipPercent
    expect(slip?.standardDeviation).toBeGreaterThan(0)
    expect(slip).toEqual(reading.results.uncertainty?.measurements.segments['L5-S1']?.slipPercent)
  })
})

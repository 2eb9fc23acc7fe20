import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'

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

// Worked example: S1 endplate P = (1000, 2000), A = (1300, 2000); L5 posterior-inferior corner
// Q = (1030, 1940). Taillard slip = (Q − P)·e / |A − P| = 30 / 300 = 10 %, Meyerding I
// (measurement literature, Example 1; definition per Butt & Saifuddin 2005).
const example1 = {
  mmPerPixel: 0.1,
  points: {
    'L5.as': [1310, 1700],
    'L5.ps': [1010, 1700],
    'L5.pi': [1030, 1940],
    'L5.ai': [1330, 1940],
    'S1.ps': [1000, 2000],
    'S1.as': [1300, 2000],
  },
}

describe('POST /api/measurements/compute', () => {
  it('answers the engine JSON for any signed-in role', async () => {
    for (const role of ['admin', 'surgeon', 'fellow', 'researcher'] as const) {
      const res = await request(app)
        .post('/api/measurements/compute')
        .set('Cookie', users[role].cookie)
        .send(example1)
      expect(res.status).toBe(200)
      const l5s1 = res.body.segments['L5-S1']
      expect(l5s1.slipPercent).toBeCloseTo((100 * 30) / 300, 9)
      expect(l5s1.slipMm).toBeCloseTo(30 * 0.1, 9)
      expect(l5s1.meyerdingGrade).toBe('I')
      expect(res.body.segments['L4-L5']).toBeUndefined()
    }
  })

  it('adds 95 % intervals on request', async () => {
    const res = await request(app)
      .post('/api/measurements/compute?uncertainty=true&sigmaMm=1')
      .set('Cookie', users.fellow.cookie)
      .send(example1)
    expect(res.status).toBe(200)
    expect(res.body.uncertainty).toBeDefined()
    expect(JSON.stringify(res.body.uncertainty)).toMatch(/slipPercent/)
  })

  it('refuses anonymous calls', async () => {
    expect((await request(app).post('/api/measurements/compute').send(example1)).status).toBe(401)
  })

  it.each([
    [{ points: { 'L9.as': [1, 2] } }, /L9\.as/],
    [{ points: { ...example1.points, 'S1.as': [1000, 2000] } }, /S1|endplate|zero/i],
  ])('answers 400 with the engine message for %j', async (body, message) => {
    const res = await request(app)
      .post('/api/measurements/compute')
      .set('Cookie', users.fellow.cookie)
      .send(body)
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_landmarks')
    expect(res.body.error.message).toMatch(message)
  })

  // The same checks as a reading's landmarks (server/schemas/readings.ts), and the spacing range
  // of radiographs that film headers are held to (0.01–5 mm per pixel).
  it.each([
    [{ points: { 'L5.as': [1, 'x'] } }, /points\.L5\.as/],
    [{ mmPerPixel: -1, points: {} }, /mmPerPixel/],
    [{ mmPerPixel: 1e308, points: example1.points }, /mmPerPixel.*0\.01–5 mm/],
    [{ mmPerPixel: [0.1, 1e308], points: example1.points }, /mmPerPixel.*0\.01–5 mm/],
    [{ mmPerPixel: 0.001, points: example1.points }, /mmPerPixel.*0\.01–5 mm/],
    [{ mmPerPixel: [0.1, 0.1, 0.1], points: example1.points }, /mmPerPixel/],
    [{ mmPerPixel: '0.1', points: example1.points }, /mmPerPixel/],
    [{ mmPerPixels: 0.1, points: example1.points }, /mmPerPixels/],
    [{ mmPerPixel: 0.1 }, /points/],
  ])('answers 400 validation_failed for %j, naming the field', async (body, message) => {
    const res = await request(app)
      .post('/api/measurements/compute')
      .set('Cookie', users.fellow.cookie)
      .send(body)
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('validation_failed')
    expect(res.body.error.message).toMatch(message)
  })

  it('refuses a spacing that JSON spells as a number too large for a double (1e400)', async () => {
    const res = await request(app)
      .post('/api/measurements/compute')
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', 'application/json')
      .send(`{"mmPerPixel":1e400,"points":${JSON.stringify(example1.points)}}`)
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/mmPerPixel/)
  })

  it('accepts [row, column] spacing and null for uncalibrated', async () => {
    for (const mmPerPixel of [[0.1, 0.1], null]) {
      const res = await request(app)
        .post('/api/measurements/compute')
        .set('Cookie', users.fellow.cookie)
        .send({ ...example1, mmPerPixel })
      expect(res.status).toBe(200)
      expect(res.body.segments['L5-S1'].slipPercent).toBeCloseTo(10, 9)
      expect(res.body.segments['L5-S1'].slipMm === null).toBe(mmPerPixel === null)
    }
  })
})

import { mkdtempSync, rmSync } from 'node:fs'
import { createServer, type Server } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import type { PixelPoint } from '../../shared/types/landmarks'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createTestUser, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { readPhantomAt, uploadPhantomFilm } from '../support/api-films'

let db: Db
let app: Express
let server: Server
let baseUrl: string
let uploadDir: string
let fellow: TestUser
let film: Awaited<ReturnType<typeof smallPhantomFiles>>
let imageId: number

const OPTIONS = { segment: 'L4-L5' as const }

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-races-'))
  const built = buildTestApp(db, { UPLOAD_DIR: uploadDir })
  app = built.app
  const config = built.config
  server = createServer(app)
  await new Promise<void>((resolveListen) => server.listen(0, '127.0.0.1', () => resolveListen()))
  const address = server.address()
  if (!address || typeof address === 'string') throw new Error('no port')
  baseUrl = `http://127.0.0.1:${address.port}`
  fellow = await createTestUser(db, config, 'fellow')
  const patientId = await insertTestPatient(db, fellow.id)
  const visitId = await insertTestVisit(db, patientId, fellow.id)
  film = await smallPhantomFiles()
  imageId = await uploadPhantomFilm(app, fellow.cookie, visitId, film)
})

afterAll(async () => {
  server.closeAllConnections()
  await new Promise<void>((resolveClose) => server.close(() => resolveClose()))
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})

/** The phantom's L4 inferior-posterior corner moved right by `dx` px: a distinct save. */
function moved(points: Record<string, PixelPoint>, dx: number): Record<string, PixelPoint> {
  const [x, y] = points['L4.pi'] as PixelPoint
  return { ...points, 'L4.pi': [x + dx, y] }
}

function save(readingId: number, points: Record<string, PixelPoint>, version: number) {
  return request(baseUrl)
    .patch(`/api/readings/${readingId}`)
    .set('Cookie', fellow.cookie)
    .send({ points, version })
}

describe('two writers on one reading', () => {
  // Optimistic concurrency (the version check of every save): of two saves made against the
  // same version, exactly one is applied and the other is told to reload.
  it('lets exactly one of two simultaneous saves win, the other getting 409, over 100 rounds', async () => {
    const reading = await readPhantomAt(
      app,
      fellow.cookie,
      film,
      imageId,
      'slip-grade',
      OPTIONS,
      false,
    )
    let version = (await db(TABLES.readings).where({ id: reading.id }).first()).version as number
    for (let round = 0; round < 100; round++) {
      const [a, b] = await Promise.all([
        save(reading.id, moved(reading.points, 1 + (round % 5) * 0.25), version),
        save(reading.id, moved(reading.points, -1 - (round % 5) * 0.25), version),
      ])
      const statuses = [a.status, b.status].sort()
      expect({ round, statuses }).toEqual({ round, statuses: [200, 409] })
      const winner = a.status === 200 ? a : b
      const loser = a.status === 200 ? b : a
      expect(loser.body.error.code).toBe('conflict')
      expect(winner.body.version).toBe(version + 1)
      // What is stored is the winner's save, whole.
      const stored = await db(TABLES.readings).where({ id: reading.id }).first()
      expect(stored.version).toBe(version + 1)
      const landmarks =
        typeof stored.landmarks === 'string' ? JSON.parse(stored.landmarks) : stored.landmarks
      expect(landmarks.points['L4.pi']).toEqual(winner.body.landmarks.points['L4.pi'])
      version += 1
    }
  }, 120_000)
})

describe('many saves at once', () => {
  it('lands 50 concurrent saves of 50 readings', async () => {
    const readings: Array<{ id: number; points: Record<string, PixelPoint> }> = []
    for (let i = 0; i < 50; i++)
      readings.push(
        await readPhantomAt(app, fellow.cookie, film, imageId, 'slip-grade', OPTIONS, false),
      )
    const answers = await Promise.all(
      readings.map((reading, i) => save(reading.id, moved(reading.points, i * 0.1), 1)),
    )
    expect(answers.map((res) => res.status)).toEqual(Array(50).fill(200))
    const stored = await db(TABLES.readings).whereIn(
      'id',
      readings.map((reading) => reading.id),
    )
    expect(stored.map((row) => row.version)).toEqual(Array(50).fill(2))
  }, 120_000)
})

import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { createServer, type Server } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import sharp from 'sharp'
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
let server: Server
let baseUrl: string
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let visitId: number

/** A small grey PNG whose pixels (and so whose content hash) differ with `seed`. */
function distinctPng(seed: number): Promise<Buffer> {
  const width = 96
  const height = 80
  const pixels = Buffer.alloc(width * height)
  for (let i = 0; i < pixels.length; i++) pixels[i] = (i * 7 + seed * 131) % 251
  return sharp(pixels, { raw: { width, height, channels: 1 } })
    .png()
    .toBuffer()
}

function filesUnder(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((entry) => entry.isFile())
    .map((entry) => join(entry.parentPath, entry.name))
}

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-concurrent-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  server = createServer(app)
  await new Promise<void>((resolveListen) => server.listen(0, '127.0.0.1', () => resolveListen()))
  const address = server.address()
  if (!address || typeof address === 'string') throw new Error('no port')
  baseUrl = `http://127.0.0.1:${address.port}`
})
afterAll(async () => {
  server.closeAllConnections()
  await new Promise<void>((resolveClose) => server.close(() => resolveClose()))
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})
beforeEach(async () => {
  await truncateAll(db)
  for (const entry of readdirSync(uploadDir))
    rmSync(join(uploadDir, entry), { recursive: true, force: true })
  users = await createUsersForEveryRole(db, config)
  const patientId = await insertTestPatient(db, users.fellow.id)
  visitId = await insertTestVisit(db, patientId, users.fellow.id)
})

describe('many uploads at once', () => {
  // The pool holds 10 connections (knexfile). Five times as many uploads in flight must neither
  // starve each other nor the rest of the product.
  it('files 50 concurrent uploads, and a patient list asked for meanwhile answers first', async () => {
    const films = await Promise.all(Array.from({ length: 50 }, (_, i) => distinctPng(i)))
    const order: string[] = []
    const uploads = films.map((film, i) =>
      request(baseUrl)
        .post(`/api/visits/${visitId}/images`)
        .set('Cookie', users.fellow.cookie)
        .field('view', 'lateral-neutral')
        .attach('file', film, `film-${i}.png`)
        .then((res) => {
          order.push('upload')
          return res
        }),
    )
    // Once the first upload has been answered, the rest are in flight (streamed, queued for
    // decoding or decoding) while another user asks for the patient list.
    await Promise.race(uploads)
    const list = await request(baseUrl).get('/api/patients').set('Cookie', users.surgeon.cookie)
    order.push('list')
    const answers = await Promise.all(uploads)

    expect(list.status).toBe(200)
    expect(list.body.items ?? list.body).toHaveLength(1)
    expect(answers.map((res) => res.status)).toEqual(Array(50).fill(201))
    // The list did not wait for the uploads to drain.
    expect(order.indexOf('list')).toBeLessThan(order.length - 1)
    const rows = await db(TABLES.images).where({ visit_id: visitId })
    expect(rows).toHaveLength(50)
    expect(new Set(rows.map((row) => row.content_hash)).size).toBe(50)
    // Every row's five files are stored; no temporary file is left.
    const stored = new Set(filesUnder(uploadDir))
    for (const row of rows) {
      for (const key of [
        'original_path',
        'display_path',
        'preview_path',
        'thumbnail_path',
        'full_depth_path',
      ])
        expect(stored.has(join(uploadDir, row[key]))).toBe(true)
    }
    expect([...stored].filter((path) => path.includes(`${join(uploadDir, 'tmp')}/`))).toEqual([])
    expect(stored.size).toBe(50 * 5)
  })

  it('files the same film uploaded to two visits at once once, and both rows share its files', async () => {
    const patientId = await insertTestPatient(db, users.fellow.id)
    const otherVisit = await insertTestVisit(db, patientId, users.fellow.id)
    const film = await distinctPng(7)
    const answers = await Promise.all(
      [visitId, otherVisit, visitId, otherVisit].map((id) =>
        request(baseUrl)
          .post(`/api/visits/${id}/images`)
          .set('Cookie', users.fellow.cookie)
          .field('view', 'lateral-neutral')
          .attach('file', film, 'same.png'),
      ),
    )
    // One per visit lands; the repeat on each visit is refused as already filed.
    expect(answers.map((res) => res.status).sort()).toEqual([201, 201, 409, 409])
    const rows = await db(TABLES.images)
    expect(rows).toHaveLength(2)
    expect(rows[0].original_path).toBe(rows[1].original_path)
    expect(filesUnder(uploadDir)).toHaveLength(5)
  })
})

describe('a full upload queue', () => {
  it('answers 503 with Retry-After and a plain message, and files the uploads it admitted', async () => {
    const small = buildTestApp(db, { UPLOAD_DIR: uploadDir, UPLOAD_QUEUE_LIMIT: '2' }).app
    const films = await Promise.all(Array.from({ length: 8 }, (_, i) => distinctPng(100 + i)))
    const answers = await Promise.all(
      films.map((film, i) =>
        request(small)
          .post(`/api/visits/${visitId}/images`)
          .set('Cookie', users.fellow.cookie)
          .field('view', 'lateral-neutral')
          .attach('file', film, `queued-${i}.png`),
      ),
    )
    const refused = answers.filter((res) => res.status === 503)
    const filed = answers.filter((res) => res.status === 201)
    expect(refused.length).toBeGreaterThan(0)
    expect(filed.length + refused.length).toBe(8)
    for (const res of refused) {
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0)
      expect(res.body.error.code).toBe('busy')
      expect(res.body.error.message).toMatch(/try again/i)
    }
    expect(await db(TABLES.images).count({ n: '*' })).toEqual([{ n: filed.length }])
  })
})

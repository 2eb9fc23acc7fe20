import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let patientIds: number[]
let visitId: number

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
  // Ids 1 to 16 exist, so a loosely read id would open a real record rather than miss.
  patientIds = []
  for (let i = 0; i < 16; i++) patientIds.push(await insertTestPatient(db, users.fellow.id))
  visitId = await insertTestVisit(db, patientIds[0] as number, users.fellow.id)
})

function expectErrorBody(body: unknown): void {
  expect(body).toMatchObject({
    error: { code: expect.any(String), message: expect.any(String) },
  })
}

describe('ids in the path are decimal digits only', () => {
  it('reads the plain decimal id', async () => {
    const res = await request(app).get('/api/patients/16').set('Cookie', users.surgeon.cookie)
    expect(res.status).toBe(200)
    expect(res.body.id).toBe(16)
  })

  // Number('0x10') is 16, Number('+1') and Number(' 1') are 1, Number('1e1') is 10 and
  // Number('1.0') is 1 (ECMA-262 §7.1.4.1.1 StringToNumber): each would open another record.
  it.each(['0x10', '+1', '1e1', ' 1', '1.0', '0b1', '0o7', '00016', '-0', '0', '1 ', '١'])(
    'answers 400 for the id %j and opens no record',
    async (id) => {
      const res = await request(app)
        .get(`/api/patients/${encodeURIComponent(id)}`)
        .set('Cookie', users.surgeon.cookie)
      expect(res.status).toBe(400)
      expectErrorBody(res.body)
      expect(res.body.error.message).toMatch(/id/)
    },
  )

  it('applies the same rule to nested routes and rendition paths', async () => {
    for (const path of [
      `/api/visits/0x${visitId.toString(16)}`,
      '/api/images/+1',
      '/api/images/1e0/files/display',
      '/api/patients/0x1/plan',
      '/api/patients/1e0/trends',
    ]) {
      const res = await request(app).get(path).set('Cookie', users.surgeon.cookie)
      expect({ path, status: res.status }).toEqual({ path, status: 400 })
      expectErrorBody(res.body)
    }
  })

  it('refuses an id too large to be a row id', async () => {
    const res = await request(app)
      .get('/api/patients/99999999999999999999')
      .set('Cookie', users.surgeon.cookie)
    expect(res.status).toBe(400)
    expectErrorBody(res.body)
  })
})

describe('bodies the server cannot read', () => {
  // RFC 8259 §8.1: JSON exchanged between systems is UTF-8; body-parser refuses other charsets
  // with 415 (its documented "charset.unsupported" error).
  it('answers 415 to JSON in a charset other than UTF-8', async () => {
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', 'application/json; charset=latin1')
      .send(JSON.stringify({ recordNumber: 'X' }))
    expect(res.status).toBe(415)
    expectErrorBody(res.body)
    expect(res.body.error.message).toMatch(/UTF-8/)
  })

  // RFC 9110 §8.4.1: a server that does not support a content coding answers 415.
  it('answers 415 to an unknown Content-Encoding', async () => {
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'x-unheard-of')
      .send(JSON.stringify({ recordNumber: 'X' }))
    expect(res.status).toBe(415)
    expectErrorBody(res.body)
    expect(res.body.error.message).toMatch(/encoding/i)
  })

  it('answers 400 to a gzip body that is not gzip', async () => {
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'gzip')
      .send('definitely not gzip')
    expect(res.status).toBe(400)
    expectErrorBody(res.body)
  })

  // RFC 7578 §4.1: multipart/form-data requires the boundary parameter.
  it('answers 400 to a multipart upload without a boundary, and keeps no file', async () => {
    const res = await request(app)
      .post(`/api/visits/${visitId}/images`)
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', 'multipart/form-data')
      .send(
        '--x\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\n\r\nabc\r\n--x--',
      )
    expect(res.status).toBe(400)
    expectErrorBody(res.body)
    expect(res.body.error.message).toMatch(/boundary/)
  })

  it('answers 400 to an upload that is not multipart at all: no file is attached', async () => {
    const res = await request(app)
      .post(`/api/visits/${visitId}/images`)
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ file: 'abc' }))
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/file/)
  })

  // RFC 8259 §8.1: JSON exchanged between systems is UTF-8. A lone 0xFF byte is no UTF-8; read
  // leniently it would be stored as U+FFFD, text the client never sent.
  it('answers 400 to a JSON body whose bytes are not UTF-8, and stores nothing', async () => {
    const before = await db('patients').count({ n: '*' }).first()
    const bytes = Buffer.concat([
      Buffer.from('{"recordNumber":"U8-1","familyName":"B'),
      Buffer.from([0xff, 0xfe]),
      Buffer.from('","givenName":"C","birthDate":"1980-01-01","sex":"male"}'),
    ])
    const res = await request(app)
      .post('/api/patients')
      .set('Cookie', users.fellow.cookie)
      .set('Content-Type', 'application/json')
      // Sent as the bytes themselves; superagent would otherwise re-encode a Buffer as JSON.
      .serialize((body: Buffer) => body as unknown as string)
      .send(bytes)
    expect(res.status).toBe(400)
    expectErrorBody(res.body)
    expect(res.body.error.message).toMatch(/UTF-8/)
    expect(await db('patients').count({ n: '*' }).first()).toEqual(before)
  })

  // RFC 3986 §2.1 percent-encoding carries octets; %FF%FE decodes to no UTF-8 text, so the router
  // cannot read the parameter (its decodeURIComponent throws URIError).
  it('answers 400 to a path parameter whose %-escapes are not UTF-8', async () => {
    for (const path of ['/api/patients/%FF%FE', `/api/images/%C3/files/display`]) {
      const res = await request(app).get(path).set('Cookie', users.surgeon.cookie)
      expect({ path, status: res.status }).toEqual({ path, status: 400 })
      expectErrorBody(res.body)
      expect(res.body.error.message).toMatch(/%-escape/)
    }
  })
})

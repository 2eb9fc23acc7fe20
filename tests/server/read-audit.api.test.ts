import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import {
  insertStudyWith,
  insertTestFilm,
  insertTestPatient,
  insertTestVisit,
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
  patientId = await insertTestPatient(db, users.fellow.id)
  visitId = await insertTestVisit(db, patientId, users.fellow.id)
  await insertStudyWith(db, users.researcher.id, [patientId])
  imageId = await insertTestFilm(db, visitId, users.fellow.id)
  // Three more films, so a list read that wrote one event per row would show.
  for (let i = 0; i < 3; i++) await insertTestFilm(db, visitId, users.fellow.id)
})

const get = (path: string, who: TestUser) => request(app).get(path).set('Cookie', who.cookie)
const viewEvents = () =>
  db(TABLES.auditEvents).where({ action: 'view' }).orderBy('id') as Promise<
    Array<{ user_id: number; entity: string; entity_id: string | null; summary: string }>
  >

describe('audited reads: one event per request, not per row', () => {
  it.each([
    ['a film list', () => `/api/visits/${visitId}/images`, 'visit', () => String(visitId)],
    ['a rendition', () => `/api/images/${imageId}/files/thumbnail`, 'image', () => String(imageId)],
    [
      'the readings of a film',
      () => `/api/images/${imageId}/readings`,
      'image',
      () => String(imageId),
    ],
    ['the reading list', () => '/api/readings', 'reading', () => null],
    ['a plan', () => `/api/patients/${patientId}/plan`, 'plan', () => String(patientId)],
  ])('records %s read by a surgeon', async (_what, path, entity, entityId) => {
    await get(path(), users.surgeon)
    const events = await viewEvents()
    expect(events).toHaveLength(1)
    expect(events[0]).toMatchObject({ user_id: users.surgeon.id, entity, entity_id: entityId() })
  })

  it('records every researcher read, once per request', async () => {
    const paths = [
      `/api/patients/${patientId}`,
      `/api/patients/${patientId}/visits`,
      '/api/studies',
      `/api/patients/${patientId}/trends`,
    ]
    for (const path of paths) expect((await get(path, users.researcher)).status).toBe(200)
    const events = await viewEvents()
    expect(events.map((event) => event.summary)).toEqual(
      paths.map((path) => `Requested ${path} (researcher)`),
    )
    expect(events.every((event) => event.user_id === users.researcher.id)).toBe(true)
  })

  it('leaves unlisted clinician reads to the services: a patient opened is one event', async () => {
    expect((await get(`/api/patients/${patientId}`, users.fellow)).status).toBe(200)
    const events = await viewEvents()
    expect(events).toHaveLength(1)
    expect(events[0]).toMatchObject({ entity: 'patient', entity_id: String(patientId) })
  })
})

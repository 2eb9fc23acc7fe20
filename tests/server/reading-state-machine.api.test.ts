import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { ReadingStatus, Role } from '../../shared/types/domain'
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

/**
 * The reading's life as a table: every action in every status for every kind of caller, with the
 * status code it answers and, when refused, the words that say why. The rater is a fellow; the
 * other fellow and the surgeon did not make the reading.
 */
type Action = 'edit' | 'submit' | 'sign' | 'return' | 'amend'
const CALLERS = ['anonymous', 'admin', 'researcher', 'rater', 'otherFellow', 'surgeon'] as const
type Caller = (typeof CALLERS)[number]
const STATUSES: ReadingStatus[] = ['draft', 'submitted', 'returned', 'signed', 'superseded']

// Columns: anonymous, admin, researcher, rater, otherFellow, surgeon.
// prettier-ignore
const TABLE: Record<Action, Record<ReadingStatus, number[]>> = {
  edit: {
    draft:      [401, 403, 403, 200, 403, 403],
    submitted:  [401, 403, 403, 409, 409, 409],
    returned:   [401, 403, 403, 200, 403, 403],
    signed:     [401, 403, 403, 409, 409, 409],
    superseded: [401, 403, 403, 409, 409, 409],
  },
  submit: {
    draft:      [401, 403, 403, 200, 403, 403],
    submitted:  [401, 403, 403, 409, 409, 409],
    returned:   [401, 403, 403, 200, 403, 403],
    signed:     [401, 403, 403, 409, 409, 409],
    superseded: [401, 403, 403, 409, 409, 409],
  },
  sign: {
    draft:      [401, 403, 403, 403, 403, 409],
    submitted:  [401, 403, 403, 403, 403, 200],
    returned:   [401, 403, 403, 403, 403, 409],
    signed:     [401, 403, 403, 403, 403, 409],
    superseded: [401, 403, 403, 403, 403, 409],
  },
  return: {
    draft:      [401, 403, 403, 403, 403, 409],
    submitted:  [401, 403, 403, 403, 403, 200],
    returned:   [401, 403, 403, 403, 403, 409],
    signed:     [401, 403, 403, 403, 403, 409],
    superseded: [401, 403, 403, 403, 403, 409],
  },
  amend: {
    draft:      [401, 403, 403, 409, 409, 409],
    submitted:  [401, 403, 403, 409, 409, 409],
    returned:   [401, 403, 403, 409, 409, 409],
    signed:     [401, 403, 403, 201, 201, 201],
    superseded: [401, 403, 403, 409, 409, 409],
  },
}

/** Why a 409 was answered: the status words, each saying what to do instead. */
function conflictMessage(action: Action, status: ReadingStatus): RegExp {
  if (status === 'signed')
    return /signed and can no longer change\. To correct it, start an amendment/
  if (status === 'superseded') return /replaced by an amendment .* open the amendment instead/
  if (action === 'amend') return /Only a signed reading is amended/
  if (status === 'submitted')
    return /submitted and awaits signature; it changes only if a surgeon returns it/
  return /Only a reading awaiting signature can be (signed|returned).*must be submitted first/
}

function refusalMessage(action: Action, caller: Caller, code: number, status: ReadingStatus) {
  if (code === 401) return /sign in/i
  if (code === 409) return conflictMessage(action, status)
  if (caller === 'admin' || caller === 'researcher') return /Your role does not allow this/
  if (action === 'sign' || action === 'return') return /Your role does not allow this/
  return /Only the rater who started this reading can change it/
}

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let otherFellow: TestUser
let imageId: number
/** One reading in each status, shared by every refused call (a refusal changes nothing). */
const shared = {} as Record<ReadingStatus, { id: number; version: number }>

const call = (who: TestUser | null, method: 'post' | 'patch', path: string, body: object) => {
  const pending = request(app)[method](path)
  if (who) pending.set('Cookie', who.cookie)
  return pending.send(body)
}

/** A fellow's reading brought into `status` through the API, as people would. */
async function readingIn(status: ReadingStatus): Promise<{ id: number; version: number }> {
  const fellow = users.fellow
  const created = await call(fellow, 'post', `/api/images/${imageId}/readings`, {
    template: 'slip-grade',
    options: { segment: 'L5-S1' },
    points: SLIP_25_PERCENT_POINTS,
  })
  let current = { id: created.body.id as number, version: created.body.version as number }
  const step = async (who: TestUser, path: string, body: object = {}) => {
    const res = await call(who, 'post', path, { version: current.version, ...body })
    expect(res.status).toBeLessThan(300)
    return res.body
  }
  if (status === 'draft') return current
  current.version = (await step(fellow, `/api/readings/${current.id}/submit`)).version
  if (status === 'submitted') return current
  if (status === 'returned') {
    current.version = (
      await step(users.surgeon, `/api/readings/${current.id}/return`, { comment: 'Check L5' })
    ).version
    return current
  }
  current.version = (await step(users.surgeon, `/api/readings/${current.id}/sign`)).version
  if (status === 'signed') return current
  const amendment = await call(fellow, 'post', `/api/readings/${current.id}/amendments`, {
    reason: 'Recalibrated',
  })
  const original = current.id
  current = { id: amendment.body.id, version: amendment.body.version }
  current.version = (await step(fellow, `/api/readings/${current.id}/submit`)).version
  await step(users.surgeon, `/api/readings/${current.id}/sign`)
  const row = await db(TABLES.readings).where({ id: original }).first()
  expect(row.status).toBe('superseded')
  return { id: original, version: row.version }
}

function actionRequest(action: Action, reading: { id: number; version: number }) {
  switch (action) {
    case 'edit':
      return {
        method: 'patch' as const,
        path: `/api/readings/${reading.id}`,
        body: { points: SLIP_25_PERCENT_POINTS, version: reading.version },
      }
    case 'submit':
      return {
        method: 'post' as const,
        path: `/api/readings/${reading.id}/submit`,
        body: { version: reading.version },
      }
    case 'sign':
      return {
        method: 'post' as const,
        path: `/api/readings/${reading.id}/sign`,
        body: { version: reading.version },
      }
    case 'return':
      return {
        method: 'post' as const,
        path: `/api/readings/${reading.id}/return`,
        body: { version: reading.version, comment: 'Redo the S1 corners' },
      }
    case 'amend':
      return {
        method: 'post' as const,
        path: `/api/readings/${reading.id}/amendments`,
        body: { reason: 'Corner moved' },
      }
  }
}

function callerUser(caller: Caller): TestUser | null {
  if (caller === 'anonymous') return null
  if (caller === 'rater') return users.fellow
  if (caller === 'otherFellow') return otherFellow
  return users[caller]
}

beforeAll(async () => {
  db = await openTestDb()
  ;({ app, config } = buildTestApp(db))
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  otherFellow = await createTestUser(db, config, 'fellow', 'other.fellow@test.example')
  const patientId = await insertTestPatient(db, users.fellow.id)
  const visitId = await insertTestVisit(db, patientId, users.fellow.id)
  await insertStudyWith(db, users.researcher.id, [patientId])
  imageId = await insertTestFilm(db, visitId, users.fellow.id)
  for (const status of STATUSES) shared[status] = await readingIn(status)
}, 60_000)
afterAll(async () => {
  await db.destroy()
})

describe('reading state machine: every action × status × caller', () => {
  for (const action of Object.keys(TABLE) as Action[]) {
    for (const status of STATUSES) {
      it(`${action} on a ${status} reading`, async () => {
        const seen: Record<string, number> = {}
        const expected: Record<string, number> = {}
        for (const [index, caller] of CALLERS.entries()) {
          const code = TABLE[action][status][index] as number
          expected[caller] = code
          const allowed = code < 300
          // A call that succeeds changes its reading, so it gets one of its own.
          const reading = allowed ? await readingIn(status) : shared[status]
          const { method, path, body } = actionRequest(action, reading)
          const res = await call(callerUser(caller), method, path, body)
          seen[caller] = res.status
          if (allowed) continue
          expect(res.body.error.message, `${caller}: ${res.body.error.message}`).toMatch(
            refusalMessage(action, caller, code, status),
          )
          const row = await db(TABLES.readings).where({ id: reading.id }).first()
          expect(row.status).toBe(status)
          expect(row.version).toBe(reading.version)
        }
        expect(seen).toEqual(expected)
      })
    }
  }
})

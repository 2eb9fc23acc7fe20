import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import { SESSION_COOKIE, signSessionToken, tokenSettingsOf } from '../../server/auth/session-token'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import type { Role } from '../../shared/types/domain'
import { analyseReliability } from '../../shared/statistics/index'
import { planAssignments } from '../../server/services/rounds'
import { openTestDb, truncateAll } from '../support/test-db'
import { smallPhantomFiles } from '../support/phantom-files'
import { uploadPhantomFilm } from '../support/api-films'
import {
  buildTestApp,
  createTestUser,
  createUsersForEveryRole,
  movableClock,
  type TestUser,
} from '../support/test-app'
import {
  insertStudyWith,
  insertTestFilm,
  insertTestPatient,
  insertTestVisit,
} from '../support/fixtures'

const DAY_MS = 86_400_000

let db: Db
let app: Express
let config: AppConfig
let clock: ReturnType<typeof movableClock>
let users: Record<Role, TestUser>
let fellow2: TestUser
let studyId: number
let filmIds: number[]
let outsideFilmId: number

// Invented identity the blinded responses must never carry.
const IDENTITY = {
  familyName: 'Vantongeren',
  givenName: 'Ottilie',
  recordNumber: 'BLND-4471',
  birthDate: '1961-09-23',
  visitDate: '2025-11-14',
}

beforeAll(async () => {
  db = await openTestDb()
  clock = movableClock(new Date())
  ;({ app, config } = buildTestApp(db, {}, { now: clock }))
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  // Back to the real time: a test that moved the clock must not age the next test's sessions.
  clock.advanceMs(Date.now() - clock().getTime())
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  fellow2 = await createTestUser(db, config, 'fellow', 'fellow2@test.example')
  const patientId = await insertTestPatient(db, users.surgeon.id, {
    familyName: IDENTITY.familyName,
    givenName: IDENTITY.givenName,
    recordNumber: IDENTITY.recordNumber,
    birthDate: IDENTITY.birthDate,
  })
  const visitId = await insertTestVisit(db, patientId, users.surgeon.id, IDENTITY.visitDate)
  filmIds = [
    await insertTestFilm(db, visitId, users.fellow.id),
    await insertTestFilm(db, visitId, users.fellow.id),
    await insertTestFilm(db, visitId, users.fellow.id),
  ]
  studyId = await insertStudyWith(db, users.researcher.id, [patientId])
  const otherPatient = await insertTestPatient(db, users.surgeon.id)
  const otherVisit = await insertTestVisit(db, otherPatient, users.surgeon.id)
  outsideFilmId = await insertTestFilm(db, otherVisit, users.fellow.id)
})

/** A fresh session cookie for the user, signed in at the given time. */
function cookieAt(user: TestUser, at: Date): string {
  const nowSeconds = Math.floor(at.getTime() / 1000)
  const token = signSessionToken(user.id, user.role, tokenSettingsOf(config), { nowSeconds })
  return `${SESSION_COOKIE}=${token}`
}

const as = (user: TestUser) => ({
  get: (path: string) => request(app).get(path).set('Cookie', user.cookie),
  post: (path: string, body: object = {}) =>
    request(app).post(path).set('Cookie', user.cookie).send(body),
  patch: (path: string, body: object) =>
    request(app).patch(path).set('Cookie', user.cookie).send(body),
})

function interRound(overrides: object = {}) {
  return {
    name: 'Slip re-read',
    kind: 'inter',
    template: 'slip-grade',
    templateOptions: { segment: 'L5-S1' },
    options: { showResultsBeforeSubmit: false },
    imageIds: filmIds,
    raterIds: [users.fellow.id, fellow2.id, users.surgeon.id],
    seed: 'fixed-seed-1',
    ...overrides,
  }
}

/**
 * A slip-grade set at L5-S1 on the 200 × 200 px test film: S1's endplate 40 px deep and L5
 * shifted forward by `shiftPx` (Taillard slip = 100·shift/40 %, Butt & Saifuddin 2005).
 */
function slipPoints(shiftPx: number): Record<string, [number, number]> {
  return {
    'L5.as': [80 + shiftPx, 60],
    'L5.ps': [40 + shiftPx, 60],
    'L5.pi': [40 + shiftPx, 90],
    'L5.ai': [80 + shiftPx, 90],
    'S1.as': [80, 100],
    'S1.ps': [40, 100],
    'S1.pw': [38, 130],
  }
}

async function readAssignment(user: TestUser, assignmentId: number, shiftPx: number) {
  const started = await as(user).post(`/api/assignments/${assignmentId}/start`)
  expect([200, 201]).toContain(started.status)
  const readingId = started.body.readingId as number
  const current = await as(user).get(`/api/readings/${readingId}`)
  const saved = await as(user).patch(`/api/readings/${readingId}`, {
    points: slipPoints(shiftPx),
    version: current.body.version,
  })
  expect(saved.status).toBe(200)
  const submitted = await as(user).post(`/api/readings/${readingId}/submit`, {
    version: saved.body.version,
  })
  expect(submitted.status).toBe(200)
  return { readingId, started, saved, submitted }
}

describe('GET /api/studies/:id/round-film-candidates', () => {
  it("lists the lateral films of the study's patients in one answer, visits numbered in time order", async () => {
    const [patientId] = (await db(TABLES.studyPatients).where({ study_id: studyId })).map(
      (row) => row.patient_id as number,
    )
    // A later visit entered first, and a frontal film: numbered by date, and left out.
    const followUp = await insertTestVisit(
      db,
      patientId!,
      users.surgeon.id,
      '2026-09-14',
      'follow-up',
    )
    const followUpFilm = await insertTestFilm(db, followUp, users.fellow.id)
    const frontal = await insertTestFilm(db, followUp, users.fellow.id)
    await db(TABLES.images).where({ id: frontal }).update({ view: 'ap' })
    const [studyCode] = await db(TABLES.patients).where({ id: patientId }).pluck('study_code')

    const res = await as(users.surgeon).get(`/api/studies/${studyId}/round-film-candidates`)
    expect(res.status).toBe(200)
    expect(res.body).toEqual({
      total: 4,
      items: [
        ...filmIds.map((imageId) => ({
          imageId,
          studyCode,
          visitKind: 'pre-op',
          visitSequence: 1,
          view: 'lateral-neutral',
        })),
        {
          imageId: followUpFilm,
          studyCode,
          visitKind: 'follow-up',
          visitSequence: 2,
          view: 'lateral-neutral',
        },
      ],
    })
    expect(res.body.items.map((item: { imageId: number }) => item.imageId)).not.toContain(
      outsideFilmId,
    )
    const events = await db(TABLES.auditEvents).where({ entity: 'study', action: 'view' })
    expect(events.map((event) => event.entity_id)).toEqual([String(studyId)])
  })

  it('is for those who start rounds, and a study that is not there is 404', async () => {
    for (const user of [users.fellow, users.researcher])
      expect((await as(user).get(`/api/studies/${studyId}/round-film-candidates`)).status).toBe(403)
    expect(
      (await as(users.admin).get(`/api/studies/${studyId}/round-film-candidates`)).status,
    ).toBe(200)
    expect((await as(users.surgeon).get('/api/studies/999999/round-film-candidates')).status).toBe(
      404,
    )
  })
})

describe('POST /api/studies/:id/rounds', () => {
  it('gives every rater a blinded assignment for every film, audited', async () => {
    const res = await as(users.surgeon).post(`/api/studies/${studyId}/rounds`, interRound())
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      studyId,
      kind: 'inter',
      template: 'slip-grade',
      status: 'open',
      imageCount: 3,
      raterCount: 3,
      repeats: 1,
      assignmentsDone: 0,
      assignmentsTotal: 9,
      seed: 'fixed-seed-1',
      version: 1,
    })
    const events = await db(TABLES.auditEvents).where({ entity: 'round', action: 'create' })
    expect(events).toHaveLength(1)
  })

  it('refuses films outside the study, raters who are not clinicians and a gap on an inter round, creating nothing', async () => {
    const outside = await as(users.surgeon).post(
      `/api/studies/${studyId}/rounds`,
      interRound({ imageIds: [filmIds[0], outsideFilmId] }),
    )
    expect(outside.status).toBe(400)
    expect(outside.body.error.details.imageIds[0]).toContain(String(outsideFilmId))
    const researcher = await as(users.surgeon).post(
      `/api/studies/${studyId}/rounds`,
      interRound({ raterIds: [users.fellow.id, users.researcher.id] }),
    )
    expect(researcher.status).toBe(400)
    expect(researcher.body.error.details.raterIds[0]).toContain('not an active fellow or surgeon')
    const gap = await as(users.surgeon).post(
      `/api/studies/${studyId}/rounds`,
      interRound({ options: { showResultsBeforeSubmit: true, gapDays: 14 } }),
    )
    expect(gap.status).toBe(400)
    const intraWithoutGap = await as(users.surgeon).post(
      `/api/studies/${studyId}/rounds`,
      interRound({ kind: 'intra', raterIds: [users.fellow.id] }),
    )
    expect(intraWithoutGap.status).toBe(400)
    expect(await db(TABLES.reliabilityRounds).count({ n: '*' })).toEqual([{ n: 0 }])
  })
})

describe('assignment order', () => {
  it('is reproducible from the seed, and the same seed gives the same orders again', async () => {
    const first = planAssignments([11, 12, 13, 14, 15, 16, 17], [1, 2], 2, 'seed-A')
    const again = planAssignments([11, 12, 13, 14, 15, 16, 17], [1, 2], 2, 'seed-A')
    expect(again).toEqual(first)
    const other = planAssignments([11, 12, 13, 14, 15, 16, 17], [1, 2], 2, 'seed-B')
    expect(other.assignments).not.toEqual(first.assignments)
  })

  it('is a permutation of the films for each rater and pass, and a repeat pass is in a new order', () => {
    const images = [21, 22, 23, 24, 25, 26]
    const plan = planAssignments(images, [7], 2, 'seed-C')
    const order = (repetition: number) =>
      plan.assignments
        .filter((a) => a.repetition === repetition)
        .sort((a, b) => a.position - b.position)
        .map((a) => a.imageId)
    expect([...order(1)].sort()).toEqual(images)
    expect([...order(2)].sort()).toEqual(images)
    expect(order(2)).not.toEqual(order(1))
    // A repeat carries a blind code of its own, so the code does not say which film it is.
    const codes = new Set(plan.assignments.map((a) => a.blindCode))
    expect(codes.size).toBe(images.length * 2)
  })

  it('stores the seeded order: two rounds with one seed list each rater’s films alike', async () => {
    await as(users.surgeon).post(`/api/studies/${studyId}/rounds`, interRound({ name: 'A' }))
    await as(users.surgeon).post(`/api/studies/${studyId}/rounds`, interRound({ name: 'B' }))
    const list = await as(users.fellow).get('/api/assignments')
    expect(list.status).toBe(200)
    expect(list.body.total).toBe(6)
    const rows = await db(TABLES.roundAssignments)
      .where({ rater_id: users.fellow.id })
      .orderBy(['round_id', 'position'])
    const byRound = (roundIndex: number) =>
      rows.filter((_, i) => Math.floor(i / 3) === roundIndex).map((r) => r.image_id)
    expect(byRound(1)).toEqual(byRound(0))
    expect(list.body.items.map((item: { position: number }) => item.position)).toEqual([
      1, 2, 3, 1, 2, 3,
    ])
  })
})

describe('rounds: list, detail, close and reopen', () => {
  it('shows progress per rater; researchers see rater codes only; a stale version is refused', async () => {
    const created = await as(users.surgeon).post(`/api/studies/${studyId}/rounds`, interRound())
    const id = created.body.id as number
    const list = await as(users.researcher).get(`/api/studies/${studyId}/rounds`)
    expect(list.status).toBe(200)
    expect(list.body).toMatchObject({ total: 1, items: [{ id, name: 'Slip re-read' }] })
    const forResearcher = await as(users.researcher).get(`/api/rounds/${id}`)
    expect(forResearcher.status).toBe(200)
    expect(forResearcher.body.raters).toEqual([
      { raterCode: 'R1', done: 0, due: 3, waiting: 0 },
      { raterCode: 'R2', done: 0, due: 3, waiting: 0 },
      { raterCode: 'R3', done: 0, due: 3, waiting: 0 },
    ])
    expect(forResearcher.body.images).toHaveLength(3)
    const forSurgeon = await as(users.surgeon).get(`/api/rounds/${id}`)
    expect(forSurgeon.body.raters[0]).toMatchObject({
      userId: users.fellow.id,
      displayName: 'Test fellow',
    })

    const outsider = await createTestUser(db, config, 'researcher', 'outsider@test.example')
    expect((await as(outsider).get(`/api/rounds/${id}`)).status).toBe(404)

    const closed = await as(users.surgeon).patch(`/api/rounds/${id}`, {
      version: 1,
      status: 'closed',
    })
    expect(closed.status).toBe(200)
    expect(closed.body).toMatchObject({ status: 'closed', version: 2 })
    const stale = await as(users.surgeon).patch(`/api/rounds/${id}`, { version: 1, status: 'open' })
    expect(stale.status).toBe(409)
    const due = await as(users.fellow).get('/api/assignments?status=due')
    expect(due.body.total).toBe(0)
    const reopened = await as(users.surgeon).patch(`/api/rounds/${id}`, {
      version: 2,
      status: 'open',
    })
    expect(reopened.body.status).toBe('open')
    expect((await db(TABLES.auditEvents).where({ entity: 'round', action: 'update' })).length).toBe(
      2,
    )
  })
})

describe('blinded readings', () => {
  it('start once, hide results until submit when the round says so, and stay with their rater', async () => {
    await as(users.surgeon).post(`/api/studies/${studyId}/rounds`, interRound())
    const [first] = (await as(users.fellow).get('/api/assignments?status=due')).body.items
    const started = await as(users.fellow).post(`/api/assignments/${first.id}/start`)
    expect(started.status).toBe(201)
    const again = await as(users.fellow).post(`/api/assignments/${first.id}/start`)
    expect(again.status).toBe(200)
    expect(again.body.readingId).toBe(started.body.readingId)
    const readingId = started.body.readingId as number

    const draft = await as(users.fellow).get(`/api/readings/${readingId}`)
    expect(draft.body).toMatchObject({
      blinded: true,
      results: null,
      createdAt: null,
      blindCode: first.blindCode,
    })
    const saved = await as(users.fellow).patch(`/api/readings/${readingId}`, {
      points: slipPoints(10),
      version: draft.body.version,
    })
    expect(saved.body.results).toBeNull()
    const submitted = await as(users.fellow).post(`/api/readings/${readingId}/submit`, {
      version: saved.body.version,
    })
    expect(submitted.status).toBe(200)
    // 10 px over a 40 px endplate: a 25 % slip (Taillard; Butt & Saifuddin 2005).
    expect(submitted.body.results.measurements.segments['L5-S1'].slipPercent).toBeCloseTo(25, 6)
    expect(submitted.body.reviewerId).toBeNull()

    // Nobody else reaches it through the readings routes, and it is in no clinical list.
    expect((await as(fellow2).get(`/api/readings/${readingId}`)).status).toBe(404)
    expect((await as(users.surgeon).get(`/api/readings/${readingId}`)).status).toBe(404)
    expect(
      (
        await as(users.surgeon).post(`/api/readings/${readingId}/sign`, {
          version: submitted.body.version,
        })
      ).status,
    ).toBe(404)
    const filmList = await as(users.fellow).get(
      `/api/images/${first.id ? (await db(TABLES.roundAssignments).where({ id: first.id }).first()).image_id : 0}/readings`,
    )
    expect(filmList.body.find((r: { id: number }) => r.id === readingId)).toBeUndefined()
    const worklist = await as(users.fellow).get('/api/readings')
    expect(worklist.body.items.find((r: { id: number }) => r.id === readingId)).toBeUndefined()
    const surgeonWorklist = await as(users.surgeon).get('/api/readings')
    expect(
      surgeonWorklist.body.items.find((r: { id: number }) => r.id === readingId),
    ).toBeUndefined()
    const exportCsv = await as(users.surgeon).get(
      `/api/exports/measurements.csv?studyId=${studyId}`,
    )
    expect(exportCsv.status).toBe(200)
    expect(exportCsv.text.split('\n').filter((line) => line.trim()).length).toBe(1)
  })

  it('answers no identity, date or other rater’s landmarks in any response a rater gets in the round', async () => {
    await as(users.surgeon).post(
      `/api/studies/${studyId}/rounds`,
      interRound({ options: { showResultsBeforeSubmit: true } }),
    )
    // The other rater reads first, with landmarks of their own.
    const [other] = (await as(fellow2).get('/api/assignments')).body.items
    await readAssignment(fellow2, other.id, 17)
    const otherReading = await db(TABLES.readings).where({ rater_id: fellow2.id }).first()
    const stored =
      typeof otherReading.landmarks === 'string'
        ? JSON.parse(otherReading.landmarks)
        : otherReading.landmarks
    const otherLandmarks = JSON.stringify(stored.points)

    const bodies: string[] = []
    const keep = (res: request.Response) => {
      bodies.push(res.text ?? JSON.stringify(res.body))
      return res
    }
    const list = keep(await as(users.fellow).get('/api/assignments'))
    for (const item of list.body.items as Array<{ id: number }>) {
      keep(await as(users.fellow).get(`/api/assignments/${item.id}/film.json`))
      const started = keep(await as(users.fellow).post(`/api/assignments/${item.id}/start`))
      const readingId = started.body.readingId
      const got = keep(await as(users.fellow).get(`/api/readings/${readingId}`))
      const saved = keep(
        await as(users.fellow).patch(`/api/readings/${readingId}`, {
          points: slipPoints(9),
          version: got.body.version,
        }),
      )
      keep(await as(users.fellow).get(`/api/readings/${readingId}/comments`))
      keep(
        await as(users.fellow).post(`/api/readings/${readingId}/submit`, {
          version: saved.body.version,
        }),
      )
      keep(await as(users.fellow).get(`/api/readings/${readingId}`))
    }
    keep(await as(users.fellow).get('/api/assignments?status=done'))
    const all = bodies.join('\n')
    for (const value of Object.values(IDENTITY)) expect(all).not.toContain(value)
    expect(all).not.toContain(otherLandmarks)
    expect(all).not.toContain('"createdAt":"')
    expect(all).not.toContain('"submittedAt":"')
    expect(all).not.toMatch(/"visitId"|"patientId"|"studyCode"/)
  })
})

describe('intra-rater rounds', () => {
  it('open the repeat only after the whole first pass and the gap, in a new order, and hide the first reading meanwhile', async () => {
    const created = await as(users.surgeon).post(`/api/studies/${studyId}/rounds`, {
      name: 'Repeat reading',
      kind: 'intra',
      template: 'slip-grade',
      options: { showResultsBeforeSubmit: true, gapDays: 14 },
      imageIds: filmIds,
      raterIds: [users.fellow.id],
      seed: 'intra-seed',
    })
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ repeats: 2, assignmentsTotal: 6 })
    const items = (await as(users.fellow).get('/api/assignments')).body.items as Array<{
      id: number
      repetition: number
      status: string
      availableFrom: string | null
    }>
    const pass1 = items.filter((item) => item.repetition === 1)
    const pass2 = items.filter((item) => item.repetition === 2)
    expect(pass1.every((item) => item.status === 'due')).toBe(true)
    expect(pass2.every((item) => item.status === 'waiting' && item.availableFrom === null)).toBe(
      true,
    )
    expect((await as(users.fellow).post(`/api/assignments/${pass2[0]!.id}/start`)).status).toBe(409)

    const firstReadings: number[] = []
    for (const item of pass1)
      firstReadings.push((await readAssignment(users.fellow, item.id, 8)).readingId)
    // The earlier reading of the film stays out of sight while the repeat is to come.
    expect((await as(users.fellow).get(`/api/readings/${firstReadings[0]}`)).status).toBe(404)
    const waiting = (await as(users.fellow).get('/api/assignments?status=due')).body
      .items as typeof items
    expect(waiting).toHaveLength(3)
    const opensAt = Date.parse(waiting[0]!.availableFrom!)
    const lastSubmit = Math.max(
      ...(await db(TABLES.readings).whereIn('id', firstReadings).select('submitted_at')).map(
        (row) => new Date(row.submitted_at).getTime(),
      ),
    )
    expect(opensAt).toBe(lastSubmit + 14 * DAY_MS)
    expect((await as(users.fellow).post(`/api/assignments/${pass2[0]!.id}/start`)).status).toBe(409)
    expect((await as(users.fellow).get(`/api/assignments/${pass2[0]!.id}/film.json`)).status).toBe(
      409,
    )

    clock.advanceMs(14 * DAY_MS + 60_000)
    // Fourteen days on, the test sessions are past their longest lifetime: sign in again.
    for (const user of [users.fellow, users.surgeon]) user.cookie = cookieAt(user, clock())
    const open = (await as(users.fellow).get('/api/assignments?status=due')).body
      .items as typeof items
    expect(open.every((item) => item.status === 'due')).toBe(true)
    expect((await as(users.fellow).post(`/api/assignments/${pass2[0]!.id}/start`)).status).toBe(201)
    const detail = await as(users.surgeon).get(`/api/rounds/${created.body.id}`)
    expect(detail.body.raters[0]).toMatchObject({ done: 3, due: 3, waiting: 0 })
  })
})

describe('GET /api/rounds/:id/results', () => {
  it('equals shared/statistics on the same table, and says when a measure has too few films', async () => {
    const created = await as(users.surgeon).post(
      `/api/studies/${studyId}/rounds`,
      interRound({ raterIds: [users.fellow.id, users.surgeon.id] }),
    )
    const id = created.body.id as number
    // Slips in px per film (blind-code order is what the table uses), for each rater.
    const shifts: Record<number, number[]> = {
      [users.fellow.id]: [4, 10, 16],
      [users.surgeon.id]: [5, 9, 18],
    }
    const codes = await db(TABLES.roundImages)
      .where({ round_id: id })
      .orderBy('blind_code')
      .select('image_id')
    const filmIndex = new Map(codes.map((row, index) => [row.image_id as number, index]))
    // Fellows never read results; a surgeon rater still reading gets none either.
    expect((await as(users.fellow).get(`/api/rounds/${id}/results`)).status).toBe(403)
    expect((await as(users.surgeon).get(`/api/rounds/${id}/results`)).status).toBe(409)
    for (const rater of [users.fellow, users.surgeon]) {
      const items = (await as(rater).get('/api/assignments')).body.items as Array<{ id: number }>
      for (const item of items) {
        const row = await db(TABLES.roundAssignments).where({ id: item.id }).first()
        await readAssignment(rater, item.id, shifts[rater.id]![filmIndex.get(row.image_id)!]!)
      }
    }
    const res = await as(users.researcher).get(`/api/rounds/${id}/results`)
    expect(res.status).toBe(200)
    expect(res.body.columns).toEqual(['R1', 'R2'])
    const slip = res.body.measures.find((m: { key: string }) => m.key === 'L5-S1.slipPercent')
    // Taillard slip % = 100 · shift / 40 px endplate depth.
    const table = [0, 1, 2].map((i) => [
      (100 * shifts[users.fellow.id]![i]!) / 40,
      (100 * shifts[users.surgeon.id]![i]!) / 40,
    ])
    const expected = analyseReliability(table)
    if (expected.status !== 'ok') throw new Error('the fixture table must be analysable')
    expect(slip.n).toBe(3)
    expect(slip.k).toBe(2)
    for (const form of ['1,1', '2,1', '3,1', '1,k', '2,k', '3,k'] as const) {
      expect(slip.forms[form].icc).toBeCloseTo(expected.forms[form].icc, 9)
      expect(slip.forms[form].f).toBeCloseTo(expected.forms[form].f, 9)
    }
    expect(slip.sem).toBeCloseTo(expected.sem, 9)
    expect(slip.mdc95).toBeCloseTo(expected.mdc95, 9)
    expect(slip.pairs[0].bias).toBeCloseTo(expected.blandAltman!.bias, 9)
    expect(slip.pairs[0].points).toHaveLength(3)
    // The same endplates for every film: no variance between films, so no ICC for the angle.
    const lordosis = res.body.measures.find(
      (m: { key: string }) => m.key === 'L5-S1.segmentalLordosisDeg',
    )
    expect(lordosis.forms).toBeNull()
    expect(lordosis.tooFew).toMatch(/Too few|variance/)
    const grade = res.body.measures.find((m: { key: string }) => m.key === 'L5-S1.meyerdingGrade')
    expect(grade.kappa).toHaveLength(1)

    const csv = await as(users.researcher).get(`/api/rounds/${id}/results.csv`)
    expect(csv.status).toBe(200)
    expect(csv.headers['content-type']).toContain('text/csv')
    expect(csv.text).toContain('L5-S1.slipPercent')
    expect(csv.text.split('\n')[0]).toContain('icc_2_1_lower')
  })
})

describe('GET /api/assignments/:id/film', () => {
  it('serves the rater the same rendition bytes as the clinical route, tagged by the assignment only', async () => {
    const phantom = await smallPhantomFiles({ seed: 5 })
    const visitId = (await db(TABLES.images).where({ id: filmIds[0] }).first()).visit_id as number
    const uploaded = await uploadPhantomFilm(app, users.fellow.cookie, visitId, phantom)
    await as(users.surgeon).post(
      `/api/studies/${studyId}/rounds`,
      interRound({ imageIds: [uploaded, filmIds[1]], raterIds: [users.fellow.id, fellow2.id] }),
    )
    const items = (await as(users.fellow).get('/api/assignments')).body.items as Array<{
      id: number
    }>
    const mine = await db(TABLES.roundAssignments).whereIn(
      'id',
      items.map((item) => item.id),
    )
    const assignmentId = mine.find((row) => row.image_id === uploaded).id as number
    const film = await as(users.fellow).get(`/api/assignments/${assignmentId}/film.json`)
    expect(film.status).toBe(200)
    // The phantom's header spacing: 750 × 625 px (tests/support/phantom-files.ts).
    expect(film.body).toMatchObject({ width: 750, height: 625 })
    const blinded = await request(app)
      .get(film.body.urls.display)
      .set('Cookie', users.fellow.cookie)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = []
        res.on('data', (chunk: Buffer) => chunks.push(chunk))
        res.on('end', () => done(null, Buffer.concat(chunks)))
      })
    expect(blinded.status).toBe(200)
    expect(blinded.headers.etag).toBe(`"assignment-${assignmentId}-display"`)
    const clinical = await request(app)
      .get(`/api/images/${uploaded}/files/display`)
      .set('Cookie', users.fellow.cookie)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = []
        res.on('data', (chunk: Buffer) => chunks.push(chunk))
        res.on('end', () => done(null, Buffer.concat(chunks)))
      })
    expect(Buffer.compare(blinded.body as Buffer, clinical.body as Buffer)).toBe(0)
    // Someone else's assignment is not found.
    expect((await as(fellow2).get(`/api/assignments/${assignmentId}/film/display`)).status).toBe(
      404,
    )
  })
})

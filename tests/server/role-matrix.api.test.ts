import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import type { Role } from '../../shared/types/domain'
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
} from '../support/fixtures'

type Who = Role | 'anonymous'

interface RouteCase {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete'
  path: (ids: Ids) => string
  body?: (ids: Ids, n: number) => object
  /** The version a versioned write sends; patches default to the patient's or visit's. */
  version?: (ids: Ids) => Promise<number>
  /** A patch that carries no version (accounts). */
  unversioned?: boolean
  expect: Record<Who, number>
}

interface Ids {
  patientId: number
  visitId: number
  imageId: number
  readingId: number
  /** A second reading by the fellow, already submitted for signature. */
  submittedReadingId: number
  fellowId: number
  submittedReadingVersion: () => Promise<number>
  studyId: number
  researcherId: number
  patientVersion: () => Promise<number>
  visitVersion: () => Promise<number>
  readingVersion: () => Promise<number>
  imageVersion: () => Promise<number>
  studyVersion: () => Promise<number>
  /** An inter-rater round of the study, read by the fellow and a second surgeon (not users.surgeon). */
  roundId: number
  roundVersion: () => Promise<number>
  roundRaterIds: number[]
  roundImageIds: number[]
  /** The fellow's first assignment in that round. */
  assignmentId: number
}

let n = 0
const newPatient = () => {
  n += 1
  return {
    recordNumber: `MX-${n}`,
    familyName: 'Matrixson',
    givenName: 'Ivo',
    birthDate: '1980-01-01',
    sex: 'male',
  }
}

// Expected status for each role on every API route (product roles: admin manages users, audit and
// settings only; surgeon and fellow work with identified patients; researcher sees de-identified data).
/** A complete L5-S1 slip-grade set on the 100 × 100 px matrix film: a plain upright box. */
const SLIP_GRADE_L5_S1 = {
  'L5.as': [70, 20],
  'L5.ps': [30, 20],
  'L5.pi': [30, 50],
  'L5.ai': [70, 50],
  'S1.as': [70, 60],
  'S1.ps': [30, 60],
  'S1.pw': [28, 90],
}

const ROUTES: RouteCase[] = [
  {
    method: 'get',
    path: () => '/api/health',
    expect: { anonymous: 200, admin: 200, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'get',
    path: () => '/api/auth/me',
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'post',
    path: () => '/api/auth/logout',
    expect: { anonymous: 401, admin: 204, surgeon: 204, fellow: 204, researcher: 204 },
  },
  {
    method: 'get',
    path: () => '/api/patients',
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'post',
    path: () => '/api/patients',
    body: () => newPatient(),
    expect: { anonymous: 401, admin: 403, surgeon: 201, fellow: 201, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/patients/${ids.patientId}`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'patch',
    path: (ids) => `/api/patients/${ids.patientId}`,
    body: () => ({ notes: 'matrix' }),
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/patients/${ids.patientId}/visits`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'post',
    path: (ids) => `/api/patients/${ids.patientId}/visits`,
    body: () => ({ visitDate: '2026-01-05', visitKind: 'pre-op' }),
    expect: { anonymous: 401, admin: 403, surgeon: 201, fellow: 201, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/visits/${ids.visitId}`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'patch',
    path: (ids) => `/api/visits/${ids.visitId}`,
    body: () => ({ indication: 'matrix' }),
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 },
  },
  // Readings: the fellow started the reading, so only the fellow may edit or submit it.
  {
    method: 'post',
    path: (ids) => `/api/images/${ids.imageId}/readings`,
    body: () => ({ template: 'slip-grade', options: { segment: 'L5-S1' } }),
    expect: { anonymous: 401, admin: 403, surgeon: 201, fellow: 201, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/images/${ids.imageId}/readings`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'get',
    path: (ids) => `/api/readings/${ids.readingId}`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'patch',
    path: (ids) => `/api/readings/${ids.readingId}`,
    body: () => ({ points: SLIP_GRADE_L5_S1 }),
    version: (ids) => ids.readingVersion(),
    expect: { anonymous: 401, admin: 403, surgeon: 403, fellow: 200, researcher: 403 },
  },
  {
    method: 'post',
    path: (ids) => `/api/readings/${ids.readingId}/submit`,
    body: () => ({}),
    version: (ids) => ids.readingVersion(),
    expect: { anonymous: 401, admin: 403, surgeon: 403, fellow: 200, researcher: 403 },
  },
  // Sign-off: the fixture's second reading is submitted, so the surgeon signs or returns it; the
  // first is a draft, so an amendment of it is refused 409 even where the role may amend.
  {
    method: 'get',
    path: () => '/api/readings?status=draft,submitted',
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'post',
    path: (ids) => `/api/readings/${ids.submittedReadingId}/sign`,
    body: () => ({}),
    version: (ids) => ids.submittedReadingVersion(),
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 403, researcher: 403 },
  },
  {
    method: 'post',
    path: (ids) => `/api/readings/${ids.submittedReadingId}/return`,
    body: () => ({ comment: 'Check the S1 corners' }),
    version: (ids) => ids.submittedReadingVersion(),
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 403, researcher: 403 },
  },
  {
    method: 'post',
    path: (ids) => `/api/readings/${ids.readingId}/amendments`,
    body: () => ({ reason: 'matrix' }),
    expect: { anonymous: 401, admin: 403, surgeon: 409, fellow: 409, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/readings/${ids.readingId}/comments`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 },
  },
  {
    method: 'post',
    path: (ids) => `/api/readings/${ids.readingId}/comments`,
    body: () => ({ text: 'matrix' }),
    expect: { anonymous: 401, admin: 403, surgeon: 201, fellow: 201, researcher: 403 },
  },
  // Plan and trends: everyone who reads the patient; the plan is written by surgeons only.
  {
    method: 'get',
    path: (ids) => `/api/patients/${ids.patientId}/plan`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'put',
    path: (ids) => `/api/patients/${ids.patientId}/plan/L4-L5`,
    body: () => ({
      parsDefectLeft: false,
      parsDefectRight: false,
      facetDegeneration: false,
      dynamicInstability: false,
      treatment: 'disc-replacement',
      implantLordosisDeg: 6,
      implantHeightMm: 10,
      notes: null,
      version: null,
    }),
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/patients/${ids.patientId}/trends`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  // Films: the fixture film has a reading, so deleting it is refused (409) even where allowed.
  {
    method: 'get',
    path: (ids) => `/api/visits/${ids.visitId}/images`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'post',
    path: (ids) => `/api/visits/${ids.visitId}/images`,
    body: () => ({}),
    expect: { anonymous: 401, admin: 403, surgeon: 400, fellow: 400, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/images/${ids.imageId}`,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'patch',
    path: (ids) => `/api/images/${ids.imageId}/calibration`,
    body: () => ({
      line: [
        [0, 0],
        [100, 0],
      ],
    }),
    version: (ids) => ids.imageVersion(),
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 },
  },
  {
    method: 'delete',
    path: (ids) => `/api/images/${ids.imageId}`,
    expect: { anonymous: 401, admin: 403, surgeon: 409, fellow: 409, researcher: 403 },
  },
  // The fixture film is a PNG without files: every role that may read it gets 409 (not DICOM).
  {
    method: 'get',
    path: (ids) => `/api/images/${ids.imageId}/dicom`,
    expect: { anonymous: 401, admin: 403, surgeon: 409, fellow: 409, researcher: 409 },
  },
  {
    method: 'post',
    path: () => '/api/measurements/compute',
    body: () => ({ points: {} }),
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 200, researcher: 200 },
  },
  // Studies: surgeons and administrators manage them; researchers read the studies they belong to.
  {
    method: 'get',
    path: () => '/api/studies',
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 200 },
  },
  {
    method: 'post',
    path: () => '/api/studies',
    body: (_ids, count) => ({ name: `Matrix cohort ${count}-${Math.random()}` }),
    expect: { anonymous: 401, admin: 201, surgeon: 201, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => '/api/studies/patient-candidates',
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => '/api/studies/member-candidates',
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/studies/${ids.studyId}`,
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 200 },
  },
  {
    method: 'patch',
    path: (ids) => `/api/studies/${ids.studyId}`,
    body: () => ({ note: 'matrix' }),
    version: (ids) => ids.studyVersion(),
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/studies/${ids.studyId}/patients`,
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 200 },
  },
  {
    method: 'put',
    path: (ids) => `/api/studies/${ids.studyId}/patients`,
    body: (ids) => ({ patientIds: [ids.patientId] }),
    version: (ids) => ids.studyVersion(),
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/studies/${ids.studyId}/members`,
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 200 },
  },
  {
    method: 'put',
    path: (ids) => `/api/studies/${ids.studyId}/members`,
    body: (ids) => ({ userIds: [ids.researcherId] }),
    version: (ids) => ids.studyVersion(),
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 403 },
  },
  // Re-reading rounds: surgeons and admins run them, study researchers read progress and results,
  // fellows and surgeons read their own assignments (someone else's is not found).
  {
    method: 'post',
    path: (ids) => `/api/studies/${ids.studyId}/rounds`,
    body: (ids, count) => ({
      name: `Matrix round ${count}`,
      kind: 'inter',
      template: 'slip-grade',
      options: { showResultsBeforeSubmit: true },
      imageIds: ids.roundImageIds,
      raterIds: ids.roundRaterIds,
    }),
    expect: { anonymous: 401, admin: 201, surgeon: 201, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/studies/${ids.studyId}/rounds`,
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 200 },
  },
  {
    method: 'get',
    path: (ids) => `/api/rounds/${ids.roundId}`,
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 200 },
  },
  {
    method: 'patch',
    path: (ids) => `/api/rounds/${ids.roundId}`,
    body: () => ({ status: 'open' }),
    version: (ids) => ids.roundVersion(),
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 403 },
  },
  ...[
    (ids: Ids) => `/api/rounds/${ids.roundId}/results`,
    (ids: Ids) => `/api/rounds/${ids.roundId}/results.csv`,
  ].map((path): RouteCase => ({
    method: 'get',
    path,
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 403, researcher: 200 },
  })),
  {
    method: 'get',
    path: () => '/api/assignments',
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 },
  },
  {
    method: 'post',
    path: (ids) => `/api/assignments/${ids.assignmentId}/start`,
    body: () => ({}),
    expect: { anonymous: 401, admin: 403, surgeon: 404, fellow: 201, researcher: 403 },
  },
  {
    method: 'get',
    path: (ids) => `/api/assignments/${ids.assignmentId}/film.json`,
    expect: { anonymous: 401, admin: 403, surgeon: 404, fellow: 200, researcher: 403 },
  },
  // Measurement exports: de-identified for researchers; clinicians' fellows and admins get none.
  ...[
    '/api/exports/measurements.csv',
    '/api/exports/measurements.xlsx',
    '/api/exports/measurements/count',
    '/api/exports/data-dictionary.csv',
  ].map((path): RouteCase => ({
    method: 'get',
    path: () => path,
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 403, researcher: 200 },
  })),
  {
    method: 'get',
    path: () => '/api/users',
    expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => '/api/users/surgeons',
    expect: { anonymous: 401, admin: 403, surgeon: 200, fellow: 200, researcher: 403 },
  },
  {
    method: 'patch',
    path: (ids) => `/api/users/${ids.fellowId}`,
    body: () => ({ displayName: 'Matrix fellow' }),
    unversioned: true,
    expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 },
  },
  // Invitations: administrators only, except the link itself, which anyone may open.
  {
    method: 'get',
    path: () => '/api/invitations',
    expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'post',
    path: () => '/api/invitations',
    body: (_ids, count) => ({
      email: `matrix.${count}@test.example`,
      displayName: 'Matrix',
      role: 'fellow',
    }),
    expect: { anonymous: 401, admin: 201, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'delete',
    path: () => '/api/invitations/999999',
    expect: { anonymous: 401, admin: 404, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => `/api/invitations/${'A'.repeat(43)}`,
    expect: { anonymous: 404, admin: 404, surgeon: 404, fellow: 404, researcher: 404 },
  },
  {
    method: 'post',
    path: () => '/api/auth/password-reset',
    body: () => ({ email: 'someone@test.example' }),
    expect: { anonymous: 202, admin: 202, surgeon: 202, fellow: 202, researcher: 202 },
  },
  {
    method: 'get',
    path: () => '/api/settings',
    expect: { anonymous: 401, admin: 200, surgeon: 200, fellow: 200, researcher: 200 },
  },
  {
    method: 'put',
    path: () => '/api/settings',
    body: () => ({ values: {}, version: 0 }),
    expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => '/api/mail',
    expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => '/api/mail/undelivered',
    expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => '/api/audit-events',
    expect: { anonymous: 401, admin: 200, surgeon: 403, fellow: 403, researcher: 403 },
  },
  {
    method: 'get',
    path: () => '/api/no-such-route',
    expect: { anonymous: 401, admin: 404, surgeon: 404, fellow: 404, researcher: 404 },
  },
]

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let ids: Ids

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
  const patientId = await insertTestPatient(db, users.fellow.id)
  const visitId = await insertTestVisit(db, patientId, users.fellow.id)
  const studyId = await insertStudyWith(db, users.researcher.id, [patientId])
  // A film row without files (the reading routes never open the image) and a draft by the fellow.
  const imageId = await insertTestFilm(db, visitId, users.fellow.id)
  const reading = await request(app)
    .post(`/api/images/${imageId}/readings`)
    .set('Cookie', users.fellow.cookie)
    // Every landmark of the template, so that the rater may submit it.
    .send({ template: 'slip-grade', options: { segment: 'L5-S1' }, points: SLIP_GRADE_L5_S1 })
  if (reading.status !== 201)
    throw new Error(`could not start the matrix reading: ${JSON.stringify(reading.body)}`)
  const readingId = reading.body.id as number
  const second = await request(app)
    .post(`/api/images/${imageId}/readings`)
    .set('Cookie', users.fellow.cookie)
    .send({ template: 'slip-grade', options: { segment: 'L5-S1' }, points: SLIP_GRADE_L5_S1 })
  const submitted = await request(app)
    .post(`/api/readings/${second.body.id}/submit`)
    .set('Cookie', users.fellow.cookie)
    .send({ version: second.body.version })
  if (submitted.status !== 200)
    throw new Error(`could not submit the matrix reading: ${JSON.stringify(submitted.body)}`)
  const submittedReadingId = second.body.id as number
  const roundImageIds = [imageId, await insertTestFilm(db, visitId, users.fellow.id)]
  const raterSurgeon = await createTestUser(db, config, 'surgeon', 'rater-surgeon@test.example')
  const roundRaterIds = [users.fellow.id, raterSurgeon.id]
  const round = await request(app)
    .post(`/api/studies/${studyId}/rounds`)
    .set('Cookie', users.surgeon.cookie)
    .send({
      name: 'Matrix round',
      kind: 'inter',
      template: 'slip-grade',
      options: { showResultsBeforeSubmit: true },
      imageIds: roundImageIds,
      raterIds: roundRaterIds,
    })
  if (round.status !== 201)
    throw new Error(`could not start the matrix round: ${JSON.stringify(round.body)}`)
  const roundId = round.body.id as number
  const assignmentId = (
    await db('round_assignments')
      .where({ round_id: roundId, rater_id: users.fellow.id })
      .orderBy('position')
      .first()
  ).id as number
  ids = {
    roundId,
    roundVersion: async () =>
      (await db('reliability_rounds').where({ id: roundId }).first()).version,
    roundRaterIds,
    roundImageIds,
    assignmentId,
    patientId,
    visitId,
    imageId,
    readingId,
    submittedReadingId,
    fellowId: users.fellow.id,
    submittedReadingVersion: async () =>
      (await db('readings').where({ id: submittedReadingId }).first()).version,
    studyId,
    researcherId: users.researcher.id,
    patientVersion: async () => (await db('patients').where({ id: patientId }).first()).version,
    visitVersion: async () => (await db('visits').where({ id: visitId }).first()).version,
    readingVersion: async () => (await db('readings').where({ id: readingId }).first()).version,
    imageVersion: async () => (await db('images').where({ id: imageId }).first()).version,
    studyVersion: async () => (await db('studies').where({ id: studyId }).first()).version,
  }
})

describe('role × route matrix', () => {
  for (const route of ROUTES) {
    it(`${route.method.toUpperCase()} ${route.path({ patientId: 1, visitId: 1, imageId: 1, readingId: 1, submittedReadingId: 1, fellowId: 1, studyId: 1, roundId: 1, assignmentId: 1 } as Ids).replace(/\/1(\/|$)/g, '/:id$1')} answers each role as designed`, async () => {
      const seen: Record<string, number> = {}
      for (const who of Object.keys(route.expect) as Who[]) {
        let body = route.body?.(ids, n)
        if (route.version && body) body = { ...body, version: await route.version(ids) }
        else if (route.method === 'patch' && body && !route.unversioned) {
          body = {
            ...body,
            version: route.path(ids).includes('/visits/')
              ? await ids.visitVersion()
              : await ids.patientVersion(),
          }
        }
        const call = request(app)[route.method](route.path(ids))
        if (who !== 'anonymous') call.set('Cookie', users[who].cookie)
        const res = body ? await call.send(body) : await call
        seen[who] = res.status
      }
      expect(seen).toEqual(route.expect)
    })
  }

  it("hides a patient outside the researcher's studies as if it did not exist", async () => {
    const otherPatient = await insertTestPatient(db, users.fellow.id)
    const res = await request(app)
      .get(`/api/patients/${otherPatient}`)
      .set('Cookie', users.researcher.cookie)
    expect(res.status).toBe(404)
    const list = await request(app).get('/api/patients').set('Cookie', users.researcher.cookie)
    expect(list.body.items.map((p: { id: number }) => p.id)).toEqual([ids.patientId])
  })
})

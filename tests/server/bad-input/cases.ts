import type { World } from './world'
import { SLIP_GRADE_L5_S1 } from './world'

/**
 * One valid request per route (for the roles that may make it): the generator starts from it and
 * breaks one thing at a time. Ids come from the world; versions are read when the case is sent.
 */
export interface InputCase {
  params?: (w: World) => Record<string, string>
  query?: (w: World) => Record<string, string>
  body?: (w: World) => Promise<unknown> | unknown
  /** The route reads multipart/form-data (film upload) rather than JSON. */
  multipart?: true
}

const id = (value: number) => ({ id: String(value) })
const withVersion = async (w: World, table: string, rowId: number, body: object) => ({
  ...body,
  version: await w.version(table, rowId),
})
const TOKEN = 'A'.repeat(43)

export const INPUT_CASES: Record<string, InputCase> = {
  'GET /api/health': {},
  'GET /api/health/details': {},
  // An address no account has, so refused sign-ins lock nobody out (see db-fingerprint.ts).
  'POST /api/auth/login': { body: () => ({ email: 'nobody@test.example', password: 'wrong-pw' }) },
  'POST /api/auth/password-reset': { body: () => ({ email: 'nobody@test.example' }) },
  'GET /api/auth/password-reset/:token': { params: () => ({ token: TOKEN }) },
  'POST /api/auth/password-reset/:token': {
    params: () => ({ token: TOKEN }),
    body: () => ({ password: 'a-long-enough-password-1' }),
  },
  'POST /api/auth/logout': {},
  'GET /api/auth/me': {},
  'GET /api/invitations': {},
  'POST /api/invitations': {
    body: () => ({ email: 'new.person@test.example', displayName: 'New Person', role: 'fellow' }),
  },
  'DELETE /api/invitations/:id': { params: (w) => id(w.invitationId) },
  'GET /api/invitations/:token': { params: () => ({ token: TOKEN }) },
  'POST /api/invitations/:token/accept': {
    params: () => ({ token: TOKEN }),
    body: () => ({ password: 'a-long-enough-password-1' }),
  },
  'GET /api/patients': { query: () => ({ q: 'TST', limit: '10', offset: '0' }) },
  'POST /api/patients': {
    body: () => ({
      recordNumber: 'BAD-1',
      familyName: 'Inputson',
      givenName: 'Ada',
      birthDate: '1980-01-01',
      sex: 'female',
    }),
  },
  'GET /api/patients/:id': { params: (w) => id(w.patientId) },
  'PATCH /api/patients/:id': {
    params: (w) => id(w.patientId),
    body: (w) => withVersion(w, 'patients', w.patientId, { notes: 'checked' }),
  },
  'GET /api/patients/:id/visits': { params: (w) => id(w.patientId) },
  'POST /api/patients/:id/visits': {
    params: (w) => id(w.patientId),
    body: () => ({ visitDate: '2026-01-05', visitKind: 'pre-op' }),
  },
  'GET /api/patients/:id/plan': { params: (w) => id(w.patientId) },
  'PUT /api/patients/:id/plan/:segment': {
    params: (w) => ({ id: String(w.patientId), segment: 'L4-L5' }),
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
  },
  'GET /api/patients/:id/trends': { params: (w) => id(w.patientId) },
  'GET /api/visits/:id': { params: (w) => id(w.visitId) },
  'PATCH /api/visits/:id': {
    params: (w) => id(w.visitId),
    body: (w) => withVersion(w, 'visits', w.visitId, { indication: 'back pain' }),
  },
  'GET /api/visits/:id/images': { params: (w) => id(w.visitId) },
  'POST /api/visits/:id/images': { params: (w) => id(w.visitId), multipart: true },
  'GET /api/images/:id': { params: (w) => id(w.imageId) },
  'DELETE /api/images/:id': { params: (w) => id(w.imageId) },
  'PATCH /api/images/:id/calibration': {
    params: (w) => id(w.imageId),
    body: (w) =>
      withVersion(w, 'images', w.imageId, {
        line: [
          [10, 10],
          [110, 10],
        ],
        lengthMm: 50,
      }),
  },
  'PUT /api/images/:id/pixel-review': {
    params: (w) => id(w.imageId),
    body: () => ({ cleared: true }),
  },
  'GET /api/images/:id/files/:name': {
    params: (w) => ({ id: String(w.imageId), name: 'display' }),
  },
  'POST /api/images/:id/readings': {
    params: (w) => id(w.imageId),
    body: () => ({
      template: 'slip-grade',
      options: { segment: 'L5-S1' },
      points: SLIP_GRADE_L5_S1,
    }),
  },
  'GET /api/images/:id/readings': { params: (w) => id(w.imageId) },
  'GET /api/readings': { query: () => ({ status: 'draft,submitted' }) },
  'GET /api/readings/:id': { params: (w) => id(w.readingId) },
  'PATCH /api/readings/:id': {
    params: (w) => id(w.readingId),
    body: (w) => withVersion(w, 'readings', w.readingId, { points: SLIP_GRADE_L5_S1 }),
  },
  'POST /api/readings/:id/submit': {
    params: (w) => id(w.readingId),
    body: (w) => withVersion(w, 'readings', w.readingId, {}),
  },
  'POST /api/readings/:id/sign': {
    params: (w) => id(w.submittedReadingId),
    body: (w) => withVersion(w, 'readings', w.submittedReadingId, {}),
  },
  'POST /api/readings/:id/return': {
    params: (w) => id(w.submittedReadingId),
    body: (w) =>
      withVersion(w, 'readings', w.submittedReadingId, { comment: 'Check the S1 corners' }),
  },
  'POST /api/readings/:id/amendments': {
    params: (w) => id(w.readingId),
    body: () => ({ reason: 'corrected corner' }),
  },
  'GET /api/readings/:id/comments': { params: (w) => id(w.readingId) },
  'POST /api/readings/:id/comments': {
    params: (w) => id(w.readingId),
    body: () => ({ text: 'looks right' }),
  },
  'GET /api/users': {},
  'GET /api/users/surgeons': {},
  'PATCH /api/users/:id': {
    params: (w) => id(w.users.fellow.id),
    body: () => ({ displayName: 'Renamed fellow' }),
  },
  'GET /api/audit-events': { query: () => ({ limit: '10' }) },
  'GET /api/audit-events/chain': {},
  'POST /api/measurements/compute': {
    query: () => ({ uncertainty: 'false' }),
    body: () => ({ mmPerPixel: 0.5, points: SLIP_GRADE_L5_S1 }),
  },
  'GET /api/settings': {},
  // No setting saved yet: the settings are at version 0.
  'PUT /api/settings': { body: () => ({ values: {}, version: 0 }) },
  'GET /api/mail': { query: () => ({ limit: '10' }) },
  'GET /api/mail/undelivered': { query: () => ({ limit: '10' }) },
  'POST /api/mail/undelivered/:id/resend': { params: () => id(1) },
  'GET /api/comparisons': { query: (w) => ({ images: `${w.imageId},${w.foreign.imageId}` }) },
  'GET /api/readings/:id/report.pdf': { params: (w) => id(w.readingId) },
  'GET /api/readings/:id/report': { params: (w) => id(w.readingId) },
  'GET /api/visits/:id/report.pdf': { params: (w) => id(w.visitId) },
  'GET /api/visits/:id/report': { params: (w) => id(w.visitId) },
  'GET /api/studies': { query: () => ({ limit: '10' }) },
  'POST /api/studies': { body: () => ({ name: 'Bad input cohort' }) },
  'GET /api/studies/patient-candidates': { query: () => ({ q: 'TST' }) },
  'GET /api/studies/member-candidates': {},
  'GET /api/studies/:id': { params: (w) => id(w.studyId) },
  'PATCH /api/studies/:id': {
    params: (w) => id(w.studyId),
    body: (w) => withVersion(w, 'studies', w.studyId, { note: 'checked' }),
  },
  'GET /api/studies/:id/patients': { params: (w) => id(w.studyId), query: () => ({ limit: '10' }) },
  'PUT /api/studies/:id/patients': {
    params: (w) => id(w.studyId),
    body: (w) => withVersion(w, 'studies', w.studyId, { patientIds: [w.patientId] }),
  },
  'GET /api/studies/:id/members': { params: (w) => id(w.studyId) },
  'PUT /api/studies/:id/members': {
    params: (w) => id(w.studyId),
    body: (w) => withVersion(w, 'studies', w.studyId, { userIds: [w.users.researcher.id] }),
  },
  'GET /api/exports/measurements/count': { query: () => ({ template: 'slip-grade' }) },
  'GET /api/exports/measurements.csv': { query: () => ({ template: 'slip-grade' }) },
  'GET /api/exports/measurements.xlsx': { query: () => ({ template: 'slip-grade' }) },
  'GET /api/exports/data-dictionary.csv': { query: () => ({}) },
  'GET /api/images/:id/dicom': { params: (w) => id(w.imageId) },
  'GET /api/rounds/rater-candidates': {},
  'POST /api/studies/:id/rounds': {
    params: (w) => id(w.studyId),
    body: (w) => ({
      name: 'Second round',
      kind: 'inter',
      template: 'slip-grade',
      options: { showResultsBeforeSubmit: false },
      imageIds: [w.imageId],
      raterIds: [w.users.fellow.id, w.users.surgeon.id],
    }),
  },
  'GET /api/studies/:id/round-film-candidates': { params: (w) => id(w.studyId) },
  'GET /api/studies/:id/rounds': { params: (w) => id(w.studyId), query: () => ({ limit: '10' }) },
  'GET /api/rounds/:id': { params: (w) => id(w.roundId) },
  'PATCH /api/rounds/:id': {
    params: (w) => id(w.roundId),
    body: (w) => withVersion(w, 'reliability_rounds', w.roundId, { status: 'closed' }),
  },
  'GET /api/rounds/:id/results': { params: (w) => id(w.roundId) },
  'GET /api/rounds/:id/results.csv': { params: (w) => id(w.roundId) },
  'GET /api/assignments': { query: () => ({ status: 'due' }) },
  'POST /api/assignments/:id/start': { params: (w) => id(w.assignmentId) },
  'GET /api/assignments/:id/film.json': { params: (w) => id(w.assignmentId) },
  'GET /api/assignments/:id/film/:name': {
    params: (w) => ({ id: String(w.assignmentId), name: 'display' }),
  },
}

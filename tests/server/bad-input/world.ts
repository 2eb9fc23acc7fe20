import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../../server/db/knex'
import type { AppConfig } from '../../../server/config'
import type { Role } from '../../../shared/types/domain'
import { createUsersForEveryRole, type TestUser } from '../../support/test-app'
import {
  insertStudyWith,
  insertTestFilm,
  insertTestPatient,
  insertTestVisit,
} from '../../support/fixtures'

/** A complete L5-S1 slip-grade set on the 200 × 200 px fixture film: a plain upright box. */
export const SLIP_GRADE_L5_S1: Record<string, [number, number]> = {
  'L5.as': [70, 20],
  'L5.ps': [30, 20],
  'L5.pi': [30, 50],
  'L5.ai': [70, 50],
  'S1.as': [70, 60],
  'S1.ps': [30, 60],
  'S1.pw': [28, 90],
}

/** The rows every input case points at: one team's records, and a second set the researcher cannot see. */
export interface World {
  users: Record<Role, TestUser>
  patientId: number
  visitId: number
  imageId: number
  readingId: number
  submittedReadingId: number
  studyId: number
  invitationId: number
  /** An inter-rater round on the team's film, read by the fellow and the surgeon. */
  roundId: number
  /** The fellow's first assignment in that round. */
  assignmentId: number
  /** Rows outside the researcher's study, started by the surgeon: someone else's records. */
  foreign: { patientId: number; visitId: number; imageId: number; readingId: number }
  version: (table: string, id: number) => Promise<number>
}

async function startReading(app: Express, user: TestUser, imageId: number): Promise<number> {
  const res = await request(app)
    .post(`/api/images/${imageId}/readings`)
    .set('Cookie', user.cookie)
    .send({ template: 'slip-grade', options: { segment: 'L5-S1' }, points: SLIP_GRADE_L5_S1 })
  if (res.status !== 201) throw new Error(`could not start a reading: ${JSON.stringify(res.body)}`)
  return res.body.id as number
}

export async function buildWorld(db: Db, app: Express, config: AppConfig): Promise<World> {
  const users = await createUsersForEveryRole(db, config)
  const patientId = await insertTestPatient(db, users.fellow.id)
  const visitId = await insertTestVisit(db, patientId, users.fellow.id)
  const studyId = await insertStudyWith(db, users.researcher.id, [patientId])
  const imageId = await insertTestFilm(db, visitId, users.fellow.id)
  const readingId = await startReading(app, users.fellow, imageId)
  const submittedReadingId = await startReading(app, users.fellow, imageId)
  const submitted = await request(app)
    .post(`/api/readings/${submittedReadingId}/submit`)
    .set('Cookie', users.fellow.cookie)
    .send({ version: 1 })
  if (submitted.status !== 200)
    throw new Error(`could not submit a reading: ${JSON.stringify(submitted.body)}`)
  const invitation = await request(app)
    .post('/api/invitations')
    .set('Cookie', users.admin.cookie)
    .send({ email: 'invited@test.example', displayName: 'Invited', role: 'fellow' })
  if (invitation.status !== 201)
    throw new Error(`could not invite: ${JSON.stringify(invitation.body)}`)

  const secondImageId = await insertTestFilm(db, visitId, users.fellow.id)
  const round = await request(app)
    .post(`/api/studies/${studyId}/rounds`)
    .set('Cookie', users.surgeon.cookie)
    .send({
      name: 'Bad input round',
      kind: 'inter',
      template: 'slip-grade',
      options: { showResultsBeforeSubmit: true },
      imageIds: [imageId, secondImageId],
      raterIds: [users.fellow.id, users.surgeon.id],
    })
  if (round.status !== 201)
    throw new Error(`could not start a round: ${JSON.stringify(round.body)}`)
  const assignment = (await db('round_assignments')
    .where({ round_id: round.body.id, rater_id: users.fellow.id })
    .orderBy('position')
    .first()) as { id: number }

  const foreignPatientId = await insertTestPatient(db, users.surgeon.id)
  const foreignVisitId = await insertTestVisit(db, foreignPatientId, users.surgeon.id)
  const foreignImageId = await insertTestFilm(db, foreignVisitId, users.surgeon.id)
  const foreignReadingId = await startReading(app, users.surgeon, foreignImageId)
  return {
    users,
    patientId,
    visitId,
    imageId,
    readingId,
    submittedReadingId,
    studyId,
    invitationId: invitation.body.id as number,
    roundId: round.body.id as number,
    assignmentId: assignment.id,
    foreign: {
      patientId: foreignPatientId,
      visitId: foreignVisitId,
      imageId: foreignImageId,
      readingId: foreignReadingId,
    },
    // A table without the row (site settings before their first save) is at version 0.
    version: async (table, id) =>
      ((await db(table).where({ id }).first()) as { version: number } | undefined)?.version ?? 0,
  }
}

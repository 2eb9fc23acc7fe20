import type { Db } from '../db/knex'
import { searchPatients } from '../db/patients'
import {
  existingPatientIds,
  findStudy,
  findStudyIdByName,
  insertStudy,
  listResearchers,
  listStudyMembers,
  listStudyPatientIds,
  replaceStudyMembers,
  replaceStudyPatients,
  researcherIds,
  searchStudies,
  updateStudy,
} from '../db/studies'
import { badRequest, conflict, notFound } from '../errors'
import type { Page, Patient } from '../../shared/types/api'
import type {
  Study,
  StudyInput,
  StudyMember,
  StudyMembersInput,
  StudyPatch,
  StudyPatientQuery,
  StudyPatientsInput,
  StudyQuery,
  StudySummary,
} from '../../shared/types/studies'
import { actorIdentifies, audit, type Actor } from './audit'
import { toDeidentifiedPatient, toIdentifiedPatient } from './patients'

/** Researchers reach only the studies they belong to; everyone else with study access, all. */
function memberScope(actor: Actor): number | undefined {
  return actor.user.role === 'researcher' ? actor.user.id : undefined
}

/** A researcher's film count leaves out the films held back from them. */
function asSeenBy(actor: Actor, study: StudySummary): StudySummary {
  if (actor.user.role !== 'researcher') return study
  return { ...study, filmCount: study.filmCount - study.heldBackFilmCount }
}

async function loadStudy(db: Db, actor: Actor, id: number): Promise<StudySummary> {
  const study = await findStudy(db, id, memberScope(actor))
  if (!study) throw notFound('study')
  return asSeenBy(actor, study)
}

async function withMembers(db: Db, study: StudySummary): Promise<Study> {
  return {
    ...study,
    members: await listStudyMembers(db, study.id),
    patientIds: await listStudyPatientIds(db, study.id),
  }
}

const staleVersion = (current: number) =>
  conflict('Someone else changed this study since you opened it. Reload to see their changes.', {
    version: [`version: current version is ${current}`],
  })

async function assertNameFree(db: Db, name: string, exceptId?: number): Promise<void> {
  const existing = await findStudyIdByName(db, name)
  if (existing !== undefined && existing !== exceptId) {
    throw conflict(`A study named "${name}" already exists.`, {
      name: [`name: "${name}" is already in use`],
    })
  }
}

export async function listStudies(
  db: Db,
  actor: Actor,
  query: StudyQuery,
): Promise<Page<StudySummary>> {
  const page = await searchStudies(db, {
    q: query.q,
    memberId: memberScope(actor),
    offset: query.offset ?? 0,
    limit: query.limit ?? 20,
  })
  return { ...page, items: page.items.map((study) => asSeenBy(actor, study)) }
}

export async function getStudy(db: Db, actor: Actor, id: number): Promise<Study> {
  return withMembers(db, await loadStudy(db, actor, id))
}

export async function createStudy(db: Db, actor: Actor, input: StudyInput): Promise<Study> {
  return db.transaction(async (trx) => {
    await assertNameFree(trx, input.name)
    const id = await insertStudy(trx, {
      name: input.name,
      description: input.description ?? null,
      note: input.note ?? null,
      createdBy: actor.user.id,
    })
    await audit(trx, actor, 'create', 'study', id, `Created study ${id}`)
    return withMembers(trx, await loadStudy(trx, actor, id))
  })
}

export async function patchStudy(
  db: Db,
  actor: Actor,
  id: number,
  patch: StudyPatch,
): Promise<Study> {
  return db.transaction(async (trx) => {
    const current = await loadStudy(trx, actor, id)
    const { version, ...fields } = patch
    if (fields.name !== undefined) await assertNameFree(trx, fields.name, id)
    if (!(await updateStudy(trx, id, version, fields))) throw staleVersion(current.version)
    const changed = Object.keys(fields).join(', ') || 'nothing'
    await audit(trx, actor, 'update', 'study', id, `Updated study ${id}: ${changed}`)
    return withMembers(trx, await loadStudy(trx, actor, id))
  })
}

export async function setStudyPatients(
  db: Db,
  actor: Actor,
  id: number,
  input: StudyPatientsInput,
): Promise<Study> {
  return db.transaction(async (trx) => {
    const current = await loadStudy(trx, actor, id)
    const known = await existingPatientIds(trx, input.patientIds)
    const unknown = input.patientIds.filter((patientId) => !known.has(patientId))
    if (unknown.length > 0) {
      throw badRequest(`patientIds: no patient with id ${unknown.slice(0, 10).join(', ')}`, {
        patientIds: [`patientIds: no patient with id ${unknown.slice(0, 10).join(', ')}`],
      })
    }
    // The version check comes first so that a stale list never replaces a newer one.
    if (!(await updateStudy(trx, id, input.version, {}))) throw staleVersion(current.version)
    const { added, removed } = await replaceStudyPatients(trx, id, input.patientIds)
    await audit(
      trx,
      actor,
      'update',
      'study',
      id,
      `Set the patients of study ${id}: ${input.patientIds.length} (${added} added, ${removed} removed)`,
    )
    return withMembers(trx, await loadStudy(trx, actor, id))
  })
}

export async function setStudyMembers(
  db: Db,
  actor: Actor,
  id: number,
  input: StudyMembersInput,
): Promise<Study> {
  return db.transaction(async (trx) => {
    const current = await loadStudy(trx, actor, id)
    const researchers = await researcherIds(trx, input.userIds)
    const refused = input.userIds.filter((userId) => !researchers.has(userId))
    if (refused.length > 0) {
      const message = `userIds: ${refused.join(', ')} ${refused.length === 1 ? 'is not a researcher account' : 'are not researcher accounts'}`
      throw badRequest(message, { userIds: [message] })
    }
    if (!(await updateStudy(trx, id, input.version, {}))) throw staleVersion(current.version)
    const { added, removed } = await replaceStudyMembers(trx, id, input.userIds)
    await audit(
      trx,
      actor,
      'update',
      'study',
      id,
      `Set the members of study ${id}: ${input.userIds.length} (${added} added, ${removed} removed)`,
    )
    return withMembers(trx, await loadStudy(trx, actor, id))
  })
}

/**
 * The study's patients, paged: de-identified for anyone who may not see identity (researchers
 * and administrators), identified and audited for surgeons.
 */
export async function listStudyPatients(
  db: Db,
  actor: Actor,
  id: number,
  query: StudyPatientQuery,
): Promise<Page<Patient>> {
  await loadStudy(db, actor, id)
  return pagePatients(db, actor, { ...query, studyId: id })
}

/**
 * Patients that may be added to a study, for those who manage studies: surgeons search names,
 * record numbers and study codes; administrators, who see no identity, search study codes.
 */
export async function listPatientCandidates(
  db: Db,
  actor: Actor,
  query: StudyPatientQuery,
): Promise<Page<Patient>> {
  return pagePatients(db, actor, query)
}

async function pagePatients(
  db: Db,
  actor: Actor,
  query: StudyPatientQuery & { studyId?: number },
): Promise<Page<Patient>> {
  const identified = actorIdentifies(actor)
  const page = await searchPatients(db, {
    q: query.q,
    studyCodeOnly: !identified,
    researcherId: actor.user.role === 'researcher' ? actor.user.id : undefined,
    studyId: query.studyId,
    sort: identified ? 'familyName' : 'studyCode',
    order: 'asc',
    offset: query.offset ?? 0,
    limit: query.limit ?? 20,
  })
  if (!identified) return { items: page.items.map(toDeidentifiedPatient), total: page.total }
  const ids = page.items.map((item) => item.id).join(', ')
  const where = query.studyId === undefined ? '' : ` of study ${query.studyId}`
  await audit(
    db,
    actor,
    'view',
    'patient-list',
    null,
    `Viewed ${page.items.length} of ${page.total} patients${where}${ids ? ` (ids ${ids})` : ''}`,
  )
  return { items: page.items.map(toIdentifiedPatient), total: page.total }
}

/** Researcher accounts that can be made members. */
export async function listMemberCandidates(db: Db): Promise<Page<StudyMember>> {
  const items = await listResearchers(db)
  return { items, total: items.length }
}

import type { Db } from '../db/knex'
import {
  findPatient,
  findPatientIdByRecordNumber,
  insertPatient,
  searchPatients,
  studyCodeExists,
  updatePatient,
  type PatientRecord,
} from '../db/patients'
import { deidentifiedAgeInYears } from '../db/rows'
import { badRequest, conflict, notFound } from '../errors'
import { findUserById } from '../db/users'
import type {
  DeidentifiedPatient,
  IdentifiedPatient,
  Page,
  Patient,
  PatientInput,
  PatientPatch,
  PatientQuery,
} from '../../shared/types/api'
import { actorIdentifies, audit, type Actor } from './audit'
import { generateStudyCode } from './study-codes'

export function toIdentifiedPatient(record: PatientRecord): IdentifiedPatient {
  return {
    kind: 'identified',
    id: record.id,
    recordNumber: record.recordNumber,
    familyName: record.familyName,
    givenName: record.givenName,
    birthDate: record.birthDate,
    sex: record.sex,
    studyCode: record.studyCode,
    osteoporosis: record.osteoporosis,
    notes: record.notes,
    responsibleSurgeonId: record.responsibleSurgeonId,
    responsibleSurgeonName: record.responsibleSurgeonName,
    visitCount: record.visitCount,
    lastVisitDate: record.lastVisitDate,
    version: record.version,
    createdAt: record.createdAt,
    updatedAt: record.updatedAt,
  }
}

/** Built field by field (never by deleting from the identified record) so nothing leaks by accident. */
export function toDeidentifiedPatient(record: PatientRecord): DeidentifiedPatient {
  return {
    kind: 'deidentified',
    id: record.id,
    studyCode: record.studyCode,
    sex: record.sex,
    ageAtFirstVisitYears: record.firstVisitDate
      ? deidentifiedAgeInYears(record.birthDate, record.firstVisitDate)
      : null,
    visitCount: record.visitCount,
  }
}

const identifies = actorIdentifies

/** Loads a patient the actor may see, or throws 404 (also for a researcher outside the study). */
export async function loadVisiblePatient(db: Db, actor: Actor, id: number): Promise<PatientRecord> {
  const record = await findPatient(db, id, identifies(actor) ? undefined : actor.user.id)
  if (!record) throw notFound('patient')
  return record
}

export async function listPatients(
  db: Db,
  actor: Actor,
  query: PatientQuery,
): Promise<Page<Patient>> {
  const identified = identifies(actor)
  const page = await searchPatients(db, {
    q: query.q,
    studyCodeOnly: !identified,
    researcherId: identified ? undefined : actor.user.id,
    // Researchers can only order by pseudonym: any other order would leak identifying data.
    sort: identified ? (query.sort ?? 'familyName') : 'studyCode',
    order: query.order ?? 'asc',
    offset: query.offset ?? 0,
    limit: query.limit ?? 20,
  })
  if (!identified) return { items: page.items.map(toDeidentifiedPatient), total: page.total }
  // The search text itself stays out of the trail: it is usually a patient's name, and the
  // trail is read by administrators who may not see names.
  const searchNote = query.q ? ` for a search of ${query.q.length} characters` : ''
  const ids = page.items.map((item) => item.id).join(', ')
  await audit(
    db,
    actor,
    'view',
    'patient-list',
    null,
    `Viewed ${page.items.length} of ${page.total} patients${searchNote}${ids ? ` (ids ${ids})` : ''}`,
  )
  return { items: page.items.map(toIdentifiedPatient), total: page.total }
}

export async function getPatient(db: Db, actor: Actor, id: number): Promise<Patient> {
  const record = await loadVisiblePatient(db, actor, id)
  if (!identifies(actor)) return toDeidentifiedPatient(record)
  await audit(db, actor, 'view', 'patient', id, `Viewed patient ${record.studyCode}`)
  return toIdentifiedPatient(record)
}

async function uniqueStudyCode(db: Db): Promise<string> {
  for (let attempt = 0; attempt < 20; attempt += 1) {
    const code = generateStudyCode()
    if (!(await studyCodeExists(db, code))) return code
  }
  throw new Error('Could not generate a unique study code')
}

async function assertRecordNumberFree(
  db: Db,
  recordNumber: string,
  exceptId?: number,
): Promise<void> {
  const existingId = await findPatientIdByRecordNumber(db, recordNumber)
  if (existingId !== undefined && existingId !== exceptId) {
    throw conflict(`A patient with record number ${recordNumber} already exists.`, {
      recordNumber: [`recordNumber: ${recordNumber} is already in use`],
    })
  }
}

/** A responsible surgeon must be an active surgeon's account. */
async function assertSurgeon(db: Db, id: number | null | undefined): Promise<void> {
  if (id === null || id === undefined) return
  const user = await findUserById(db, id)
  if (!user || !user.active || user.role !== 'surgeon') {
    throw badRequest(`responsibleSurgeonId: ${id} is not an active surgeon`, {
      responsibleSurgeonId: ['responsibleSurgeonId: choose an active surgeon'],
    })
  }
}

export async function createPatient(
  db: Db,
  actor: Actor,
  input: PatientInput,
): Promise<IdentifiedPatient> {
  return db.transaction(async (trx) => {
    await assertRecordNumberFree(trx, input.recordNumber)
    await assertSurgeon(trx, input.responsibleSurgeonId)
    const id = await insertPatient(trx, {
      recordNumber: input.recordNumber,
      familyName: input.familyName,
      givenName: input.givenName,
      birthDate: input.birthDate,
      sex: input.sex,
      osteoporosis: input.osteoporosis ?? false,
      notes: input.notes ?? null,
      responsibleSurgeonId: input.responsibleSurgeonId ?? null,
      studyCode: await uniqueStudyCode(trx),
      createdBy: actor.user.id,
    })
    const record = await findPatient(trx, id)
    if (!record) throw notFound('patient')
    await audit(trx, actor, 'create', 'patient', id, `Created patient ${record.studyCode}`)
    return toIdentifiedPatient(record)
  })
}

export async function patchPatient(
  db: Db,
  actor: Actor,
  id: number,
  patch: PatientPatch,
): Promise<IdentifiedPatient> {
  return db.transaction(async (trx) => {
    const current = await findPatient(trx, id)
    if (!current) throw notFound('patient')
    const { version, ...fields } = patch
    if (fields.recordNumber !== undefined)
      await assertRecordNumberFree(trx, fields.recordNumber, id)
    await assertSurgeon(trx, fields.responsibleSurgeonId)
    if (
      fields.birthDate !== undefined &&
      current.firstVisitDate !== null &&
      fields.birthDate > current.firstVisitDate
    ) {
      throw badRequest('birthDate: cannot be after the first visit', {
        birthDate: ['birthDate: cannot be after the first visit'],
      })
    }
    const changed = await updatePatient(trx, id, version, fields)
    if (!changed) {
      throw conflict(
        'Someone else changed this patient since you opened it. Reload to see their changes.',
        {
          version: [`version: current version is ${current.version}`],
        },
      )
    }
    const changedFields = Object.keys(fields).join(', ') || 'nothing'
    await audit(
      trx,
      actor,
      'update',
      'patient',
      id,
      `Updated patient ${current.studyCode}: ${changedFields}`,
    )
    const record = await findPatient(trx, id)
    if (!record) throw notFound('patient')
    return toIdentifiedPatient(record)
  })
}

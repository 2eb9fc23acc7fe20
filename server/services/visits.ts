import type { Db } from '../db/knex'
import { countHeldBackFilmsByVisit } from '../db/images'
import {
  findVisit,
  insertVisit,
  listVisitsOfPatient,
  updateVisit,
  type VisitRecord,
} from '../db/visits'
import type { PatientRecord } from '../db/patients'
import { ageInYears, deidentifiedAgeInYears } from '../db/rows'
import { asNotFound, badRequest, conflict, notFound } from '../errors'
import type {
  DeidentifiedVisit,
  IdentifiedVisit,
  Visit,
  VisitInput,
  VisitPatch,
} from '../../shared/types/api'
import { actorIdentifies, audit, type Actor } from './audit'
import { loadVisiblePatient } from './patients'

export function toIdentifiedVisit(visit: VisitRecord, patient: PatientRecord): IdentifiedVisit {
  return {
    kind: 'identified',
    id: visit.id,
    patientId: visit.patientId,
    visitDate: visit.visitDate,
    visitKind: visit.kind,
    monthsSinceSurgery: visit.monthsSinceSurgery,
    indication: visit.indication,
    ageAtVisitYears: ageInYears(patient.birthDate, visit.visitDate),
    version: visit.version,
    createdAt: visit.createdAt,
  }
}

/** Dates and free text are left out: both can identify a patient. */
export function toDeidentifiedVisit(
  visit: VisitRecord,
  patient: PatientRecord,
  sequence: number,
): DeidentifiedVisit {
  return {
    kind: 'deidentified',
    id: visit.id,
    patientId: visit.patientId,
    sequence,
    visitKind: visit.kind,
    monthsSinceSurgery: visit.monthsSinceSurgery,
    ageAtVisitYears: deidentifiedAgeInYears(patient.birthDate, visit.visitDate),
  }
}

const identifies = actorIdentifies

export async function listVisits(db: Db, actor: Actor, patientId: number): Promise<Visit[]> {
  const patient = await loadVisiblePatient(db, actor, patientId)
  const visits = await listVisitsOfPatient(db, patientId)
  if (!identifies(actor)) {
    const heldBack = await countHeldBackFilmsByVisit(
      db,
      visits.map((visit) => visit.id),
    )
    return visits.map((visit, index) => ({
      ...toDeidentifiedVisit(visit, patient, index + 1),
      heldBackFilmCount: heldBack.get(visit.id) ?? 0,
    }))
  }
  await audit(
    db,
    actor,
    'view',
    'patient',
    patientId,
    `Viewed visits of patient ${patient.studyCode}`,
  )
  return visits.map((visit) => toIdentifiedVisit(visit, patient))
}

/** Loads a visit whose patient the actor may see, with that patient. */
export async function loadVisibleVisit(
  db: Db,
  actor: Actor,
  visitId: number,
): Promise<{ visit: VisitRecord; patient: PatientRecord }> {
  const visit = await findVisit(db, visitId)
  if (!visit) throw notFound('visit')
  try {
    return { visit, patient: await loadVisiblePatient(db, actor, visit.patientId) }
  } catch (error) {
    return asNotFound(error, 'visit')
  }
}

export async function getVisit(db: Db, actor: Actor, visitId: number): Promise<Visit> {
  const { visit, patient } = await loadVisibleVisit(db, actor, visitId)
  if (!identifies(actor)) {
    const all = await listVisitsOfPatient(db, patient.id)
    return toDeidentifiedVisit(visit, patient, all.findIndex((v) => v.id === visit.id) + 1)
  }
  await audit(
    db,
    actor,
    'view',
    'visit',
    visitId,
    `Viewed visit ${visitId} of patient ${patient.studyCode}`,
  )
  return toIdentifiedVisit(visit, patient)
}

function assertAfterBirth(visitDate: string, patient: PatientRecord): void {
  if (visitDate < patient.birthDate) {
    throw badRequest('visitDate: cannot be before the date of birth', {
      visitDate: ['visitDate: cannot be before the date of birth'],
    })
  }
}

export async function createVisit(
  db: Db,
  actor: Actor,
  patientId: number,
  input: VisitInput,
): Promise<IdentifiedVisit> {
  return db.transaction(async (trx) => {
    const patient = await loadVisiblePatient(trx, actor, patientId)
    assertAfterBirth(input.visitDate, patient)
    const id = await insertVisit(trx, {
      patientId,
      visitDate: input.visitDate,
      kind: input.visitKind,
      monthsSinceSurgery: input.monthsSinceSurgery ?? null,
      indication: input.indication ?? null,
      createdBy: actor.user.id,
    })
    await audit(
      trx,
      actor,
      'create',
      'visit',
      id,
      `Added a ${input.visitKind} visit to patient ${patient.studyCode}`,
    )
    const visit = await findVisit(trx, id)
    if (!visit) throw notFound('visit')
    return toIdentifiedVisit(visit, patient)
  })
}

export async function patchVisit(
  db: Db,
  actor: Actor,
  visitId: number,
  patch: VisitPatch,
): Promise<IdentifiedVisit> {
  return db.transaction(async (trx) => {
    const { visit, patient } = await loadVisibleVisit(trx, actor, visitId)
    const { version, ...fields } = patch
    const kind = fields.visitKind ?? visit.kind
    const months =
      fields.monthsSinceSurgery !== undefined ? fields.monthsSinceSurgery : visit.monthsSinceSurgery
    if (kind === 'follow-up' && (months === null || months === undefined)) {
      throw badRequest('monthsSinceSurgery: is required for a follow-up visit', {
        monthsSinceSurgery: ['monthsSinceSurgery: is required for a follow-up visit'],
      })
    }
    if (
      kind !== 'follow-up' &&
      fields.monthsSinceSurgery !== undefined &&
      fields.monthsSinceSurgery !== null
    ) {
      throw badRequest('monthsSinceSurgery: applies to follow-up visits only', {
        monthsSinceSurgery: ['monthsSinceSurgery: applies to follow-up visits only'],
      })
    }
    if (fields.visitDate) assertAfterBirth(fields.visitDate, patient)
    // Changing the kind away from follow-up clears the interval rather than leaving a stale one.
    const monthsSinceSurgery = kind === 'follow-up' ? months : null
    const changed = await updateVisit(trx, visitId, version, {
      visitDate: fields.visitDate,
      kind: fields.visitKind,
      indication: fields.indication,
      monthsSinceSurgery,
    })
    if (!changed) {
      throw conflict(
        'Someone else changed this visit since you opened it. Reload to see their changes.',
        {
          version: [`version: current version is ${visit.version}`],
        },
      )
    }
    await audit(
      trx,
      actor,
      'update',
      'visit',
      visitId,
      `Updated visit ${visitId} of patient ${patient.studyCode}: ${Object.keys(fields).join(', ') || 'nothing'}`,
    )
    const updated = await findVisit(trx, visitId)
    if (!updated) throw notFound('visit')
    return toIdentifiedVisit(updated, patient)
  })
}

import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { insertPatient } from '../../server/db/patients'
import { insertVisit } from '../../server/db/visits'
import type { VisitKind } from '../../shared/types/domain'

let counter = 0

/** An invented patient written straight to the database. */
export async function insertTestPatient(
  db: Db,
  createdBy: number,
  overrides: Partial<{
    recordNumber: string
    familyName: string
    givenName: string
    birthDate: string
    studyCode: string
  }> = {},
): Promise<number> {
  counter += 1
  return insertPatient(db, {
    recordNumber: overrides.recordNumber ?? `TST-${String(counter).padStart(5, '0')}`,
    familyName: overrides.familyName ?? 'Quillfeather',
    givenName: overrides.givenName ?? 'Odalys',
    birthDate: overrides.birthDate ?? '1970-05-17',
    sex: 'female',
    osteoporosis: false,
    notes: 'Invented test patient',
    studyCode: overrides.studyCode ?? `EP-T${String(counter).padStart(5, '0')}`,
    createdBy,
  })
}

export async function insertTestVisit(
  db: Db,
  patientId: number,
  createdBy: number,
  visitDate = '2026-03-02',
  kind: VisitKind = 'pre-op',
): Promise<number> {
  return insertVisit(db, {
    patientId,
    visitDate,
    kind,
    monthsSinceSurgery: null,
    indication: 'Invented indication text',
    createdBy,
  })
}

/** Puts patients into a study that the researcher belongs to. */
export async function insertStudyWith(
  db: Db,
  researcherId: number,
  patientIds: number[],
): Promise<number> {
  counter += 1
  const [studyId] = await db(TABLES.studies).insert({
    name: `Test cohort ${counter}`,
    created_by: researcherId,
  })
  await db(TABLES.studyMembers).insert({ study_id: studyId, user_id: researcherId })
  for (const patientId of patientIds)
    await db(TABLES.studyPatients).insert({ study_id: studyId, patient_id: patientId })
  return studyId as number
}

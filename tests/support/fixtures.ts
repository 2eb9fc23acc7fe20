import type { BurnedInAnnotation } from '../../shared/types/pixel-review'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { insertPatient } from '../../server/db/patients'
import { insertVisit } from '../../server/db/visits'
import { insertImage } from '../../server/db/images'
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

/**
 * A film row without files, 200 × 200 px at 0.5 mm/px (the reading routes never open the image
 * files; the engine needs only the size and the spacing). Its header claim defaults to NO burned-in
 * annotation, so researchers are served it; pass 'unknown' or 'yes' to test the films held back.
 */
export async function insertTestFilm(
  db: Db,
  visitId: number,
  uploadedBy: number,
  burnedInAnnotation: BurnedInAnnotation = 'no',
): Promise<number> {
  counter += 1
  const hash = counter.toString(16).padStart(64, '0')
  return insertImage(db, {
    visitId,
    view: 'lateral-neutral',
    fileKind: 'png',
    contentHash: hash,
    originalPath: `films/${hash.slice(0, 2)}/${hash}/original.png`,
    displayPath: `films/${hash.slice(0, 2)}/${hash}/display.png`,
    previewPath: `films/${hash.slice(0, 2)}/${hash}/preview.png`,
    thumbnailPath: `films/${hash.slice(0, 2)}/${hash}/thumbnail.png`,
    fullDepthPath: `films/${hash.slice(0, 2)}/${hash}/full-depth.png`,
    originalName: 'test-film.png',
    sizeBytes: 1,
    width: 200,
    height: 200,
    bitsStored: 8,
    mmPerPixelRow: 0.5,
    mmPerPixelColumn: 0.5,
    spacingSource: 'dicom-pixel-spacing',
    spacingNote: null,
    windowCenter: null,
    windowWidth: null,
    acquiredAt: null,
    dicomAttributes: null,
    burnedInAnnotation,
    uploadedBy,
  })
}

/**
 * Slip-grade landmarks at L5-S1: the S1 endplate 40 px deep along +x and L5 shifted 10 px
 * forward, a 25 % Taillard slip (Butt & Saifuddin 2005, Clin Radiol 60:533).
 */
export const SLIP_25_PERCENT_POINTS: Record<string, [number, number]> = {
  'L5.as': [90, 60],
  'L5.ps': [50, 60],
  'L5.pi': [50, 90],
  'L5.ai': [90, 90],
  'S1.as': [80, 100],
  'S1.ps': [40, 100],
  'S1.pw': [38, 130],
}

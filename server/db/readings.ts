import type { Db } from './knex'
import { TABLES } from './tables'
import { fromResultsColumns, toResultsColumns } from './reading-results-columns'
import { parseJson, toBoolean, toIsoDateTime, toIsoDateTimeOrNull } from './rows'
import type { ReadingStatus, ReadingTemplate } from '../../shared/types/domain'
import type { LandmarkDocument } from '../../shared/types/landmarks'
import type {
  Reading,
  ReadingCalibration,
  ReadingResults,
  SuggestionUse,
} from '../../shared/types/readings'
import type { TemplateOptions } from '../../shared/readings/templates'

/** A stored reading: the API's Reading with its timestamps always present. */
export interface ReadingRecord extends Omit<Reading, 'createdAt' | 'updatedAt'> {
  createdAt: string
  updatedAt: string
}

type RawRow = Record<string, unknown>

const COLUMNS = [
  'r.id',
  'r.image_id',
  'r.paired_image_id',
  'r.rater_id',
  'u.display_name as rater_name',
  'r.template',
  'r.template_options',
  'r.landmarks',
  'r.paired_landmarks',
  'r.suggestion_use',
  'r.calibration',
  'r.paired_calibration',
  'r.results',
  'r.results_uncertainty',
  'r.engine_version',
  'r.status',
  'r.version',
  'r.blinded',
  'r.supersedes_id',
  'r.supersede_reason',
  'r.reviewer_id',
  'r.submitted_at',
  'r.signed_at',
  'r.signed_by',
  'signer.display_name as signed_by_name',
  'r.returned_by',
  'returner.display_name as returned_by_name',
  'r.returned_at',
  'r.return_comment',
  'r.created_at',
  'r.updated_at',
]

/** The amendment of reading `r` (at most one: a second is refused while one exists). */
export const SUPERSEDED_BY = `(SELECT MIN(amendment.id) FROM ${TABLES.readings} AS amendment WHERE amendment.supersedes_id = r.id) AS superseded_by_id`

function toReading(row: RawRow): ReadingRecord {
  return {
    id: row.id as number,
    imageId: row.image_id as number,
    pairedImageId: row.paired_image_id as number | null,
    raterId: row.rater_id as number,
    raterName: row.rater_name as string,
    template: row.template as ReadingTemplate,
    options: parseJson<TemplateOptions>(row.template_options) ?? {},
    landmarks: parseJson<LandmarkDocument>(row.landmarks) ?? { points: {} },
    pairedLandmarks: parseJson<LandmarkDocument>(row.paired_landmarks),
    suggestionUse: parseJson<SuggestionUse>(row.suggestion_use) ?? { points: {} },
    calibration: parseJson<ReadingCalibration>(row.calibration) ?? {
      mmPerPixel: null,
      source: 'none',
    },
    pairedCalibration: parseJson<ReadingCalibration>(row.paired_calibration),
    results: fromResultsColumns(row.results, row.results_uncertainty),
    engineVersion: row.engine_version as string,
    status: row.status as ReadingStatus,
    version: row.version as number,
    blinded: toBoolean(row.blinded as number),
    supersedesId: row.supersedes_id as number | null,
    supersedeReason: row.supersede_reason as string | null,
    supersededById: (row.superseded_by_id as number | null) ?? null,
    reviewerId: row.reviewer_id as number | null,
    submittedAt: toIsoDateTimeOrNull(row.submitted_at as Date | null),
    signedAt: toIsoDateTimeOrNull(row.signed_at as Date | null),
    signedBy: row.signed_by as number | null,
    signedByName: (row.signed_by_name as string | null) ?? null,
    returnedBy: row.returned_by as number | null,
    returnedByName: (row.returned_by_name as string | null) ?? null,
    returnedAt: toIsoDateTimeOrNull(row.returned_at as Date | null),
    returnComment: row.return_comment as string | null,
    createdAt: toIsoDateTime(row.created_at as Date),
    updatedAt: toIsoDateTime(row.updated_at as Date),
  }
}

const withRater = (db: Db) =>
  db(`${TABLES.readings} as r`)
    .join(`${TABLES.users} as u`, 'u.id', 'r.rater_id')
    .leftJoin(`${TABLES.users} as signer`, 'signer.id', 'r.signed_by')
    .leftJoin(`${TABLES.users} as returner`, 'returner.id', 'r.returned_by')

const selectReadings = (db: Db) => withRater(db).select([...COLUMNS, db.raw(SUPERSEDED_BY)])

export async function findReading(db: Db, id: number): Promise<ReadingRecord | undefined> {
  if (!Number.isSafeInteger(id)) return undefined
  const row = (await selectReadings(db).where('r.id', id).first()) as RawRow | undefined
  return row ? toReading(row) : undefined
}

/** Locks a reading's row for the rest of the transaction (sign-off checks, then writes). */
export async function lockReading(db: Db, id: number): Promise<void> {
  await db(TABLES.readings).where({ id }).forUpdate().first('id')
}

/** Readings of a film (as the first film or as the paired one), newest first. */
export async function listReadingsOfImage(db: Db, imageId: number): Promise<ReadingRecord[]> {
  const rows = (await selectReadings(db)
    .where((query) => query.where('r.image_id', imageId).orWhere('r.paired_image_id', imageId))
    .orderBy([
      { column: 'r.created_at', order: 'desc' },
      { column: 'r.id', order: 'desc' },
    ])) as RawRow[]
  return rows.map(toReading)
}

/** What a save writes: the landmarks and everything computed from them. */
export interface ReadingComputation {
  landmarks: LandmarkDocument
  pairedLandmarks: LandmarkDocument | null
  calibration: ReadingCalibration
  pairedCalibration: ReadingCalibration | null
  results: ReadingResults
  engineVersion: string
}

export interface NewReading extends ReadingComputation {
  imageId: number
  pairedImageId: number | null
  raterId: number
  template: ReadingTemplate
  options: TemplateOptions
  /** An amendment: the signed reading it replaces once signed, and why. */
  supersedes?: { id: number; reason: string }
  /** An amendment starts from the amended reading's landmarks, and so from their history. */
  suggestionUse?: SuggestionUse
}

function computationColumns(computation: ReadingComputation) {
  return {
    landmarks: JSON.stringify(computation.landmarks),
    paired_landmarks: computation.pairedLandmarks
      ? JSON.stringify(computation.pairedLandmarks)
      : null,
    calibration: JSON.stringify(computation.calibration),
    paired_calibration: computation.pairedCalibration
      ? JSON.stringify(computation.pairedCalibration)
      : null,
    ...toResultsColumns(computation.results),
    engine_version: computation.engineVersion,
  }
}

export async function insertReading(db: Db, reading: NewReading): Promise<number> {
  const [id] = await db(TABLES.readings).insert({
    image_id: reading.imageId,
    paired_image_id: reading.pairedImageId,
    rater_id: reading.raterId,
    template: reading.template,
    segment: reading.options.segment ?? null,
    template_options: JSON.stringify(reading.options),
    supersedes_id: reading.supersedes?.id ?? null,
    supersede_reason: reading.supersedes?.reason ?? null,
    suggestion_use: reading.suggestionUse ? JSON.stringify(reading.suggestionUse) : null,
    ...computationColumns(reading),
  })
  return id as number
}

/** Statuses in which the rater still edits: a draft, or a reading returned for changes. */
const EDITABLE = ['draft', 'returned'] as const

/** Saves a draft only if nobody saved it since `expectedVersion`; false otherwise. */
export async function updateDraftReading(
  db: Db,
  id: number,
  expectedVersion: number,
  computation: ReadingComputation,
  suggestionUse: SuggestionUse,
): Promise<boolean> {
  const changed = await db(TABLES.readings)
    .where({ id, version: expectedVersion })
    .whereIn('status', EDITABLE)
    .update({
      ...computationColumns(computation),
      suggestion_use: JSON.stringify(suggestionUse),
      version: db.raw('version + 1'),
      updated_at: new Date(),
    })
  return changed === 1
}

/**
 * Moves a draft (or a returned reading) to submitted with its final computation and the surgeon
 * it goes to, under the same version guard.
 */
export async function submitDraftReading(
  db: Db,
  id: number,
  expectedVersion: number,
  computation: ReadingComputation,
  reviewerId: number | null,
): Promise<boolean> {
  const now = new Date()
  const changed = await db(TABLES.readings)
    .where({ id, version: expectedVersion })
    .whereIn('status', EDITABLE)
    .update({
      ...computationColumns(computation),
      status: 'submitted',
      submitted_at: now,
      reviewer_id: reviewerId,
      version: db.raw('version + 1'),
      updated_at: now,
    })
  return changed === 1
}

/**
 * Signs a submitted reading under the version guard: status signed, signer and time recorded,
 * with its final computation when one is given. False when the reading is not submitted or was
 * changed since `expectedVersion`.
 */
export async function signSubmittedReading(
  db: Db,
  id: number,
  expectedVersion: number,
  signerId: number,
  computation?: ReadingComputation,
): Promise<boolean> {
  const now = new Date()
  const changed = await db(TABLES.readings)
    .where({ id, version: expectedVersion, status: 'submitted' })
    .update({
      ...(computation ? computationColumns(computation) : {}),
      status: 'signed',
      signed_by: signerId,
      signed_at: now,
      version: db.raw('version + 1'),
      updated_at: now,
    })
  return changed === 1
}

/** Sends a submitted reading back to its rater with the surgeon's comment. */
export async function returnSubmittedReading(
  db: Db,
  id: number,
  expectedVersion: number,
  returnedBy: number,
  comment: string,
): Promise<boolean> {
  const now = new Date()
  const changed = await db(TABLES.readings)
    .where({ id, version: expectedVersion, status: 'submitted' })
    .update({
      status: 'returned',
      returned_by: returnedBy,
      returned_at: now,
      return_comment: comment,
      version: db.raw('version + 1'),
      updated_at: now,
    })
  return changed === 1
}

/** The signed original of a signed amendment becomes superseded. */
export async function supersedeSignedReading(db: Db, id: number): Promise<boolean> {
  const changed = await db(TABLES.readings)
    .where({ id, status: 'signed' })
    .update({ status: 'superseded', version: db.raw('version + 1'), updated_at: new Date() })
  return changed === 1
}

/**
 * Candidate subsidence baselines of a patient, earliest first: submitted or signed
 * construct-check readings on post-op visits other than the current reading's own visit (a
 * second rater on the same film is a reliability question, not subsidence) and not later than
 * it. The caller picks, per treated segment, the earliest that measures that segment.
 */
export async function findConstructBaselines(
  db: Db,
  patientId: number,
  current: { readingId: number | null; visitId: number; visitDate: string },
): Promise<ReadingRecord[]> {
  const query = selectReadings(db)
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .where({ 'v.patient_id': patientId, 'v.kind': 'post-op', 'r.template': 'construct-check' })
    .whereIn('r.status', ['submitted', 'signed'])
    .where('r.blinded', false)
    .where('v.visit_date', '<=', current.visitDate)
    .whereNot('v.id', current.visitId)
    .orderBy([
      { column: 'v.visit_date', order: 'asc' },
      { column: 'r.submitted_at', order: 'asc' },
      { column: 'r.id', order: 'asc' },
    ])
  if (current.readingId !== null) query.whereNot('r.id', current.readingId)
  return ((await query) as RawRow[]).map(toReading)
}

import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { fromResultsColumn } from './reading-results-columns'
import { parseJson, toIsoDateTime, toIsoDateTimeOrNull } from './rows'
import { IMAGE_VIEWS, type ImageView, type Role, type VisitKind } from '../../shared/types/domain'
import type { RoundFilmCandidate } from '../../shared/types/round-films'
import type {
  RoundKind,
  RoundOptions,
  RoundStatus,
  RoundSummary,
  RoundTemplate,
  RoundTemplateOptions,
} from '../../shared/types/rounds'

/** A stored round with its counts: the summary the API sends, less the finished count the service works out. */
export type RoundRecord = Omit<RoundSummary, 'assignmentsDone'>

type RawRow = Record<string, unknown>

function toRound(row: RawRow): RoundRecord {
  return {
    id: row.id as number,
    studyId: row.study_id as number,
    name: row.name as string,
    kind: row.kind as RoundKind,
    template: row.template as RoundTemplate,
    templateOptions: parseJson<RoundTemplateOptions>(row.template_options) ?? {},
    options: parseJson<RoundOptions>(row.options) ?? { showResultsBeforeSubmit: true },
    status: row.status as RoundStatus,
    repeats: row.repeats as number,
    seed: row.seed as string,
    version: row.version as number,
    createdAt: toIsoDateTime(row.created_at as Date),
    imageCount: Number(row.image_count),
    raterCount: Number(row.rater_count),
    assignmentsTotal: Number(row.assignment_count),
  }
}

function selectRounds(db: Db): Knex.QueryBuilder {
  const count = (table: string) => db(`${table} as c`).whereRaw('c.round_id = rr.id').count('*')
  return db(`${TABLES.reliabilityRounds} as rr`).select(
    'rr.*',
    count(TABLES.roundImages).as('image_count'),
    count(TABLES.roundRaters).as('rater_count'),
    count(TABLES.roundAssignments).as('assignment_count'),
  )
}

export async function findRound(db: Db, id: number): Promise<RoundRecord | undefined> {
  const row = (await selectRounds(db).where('rr.id', id).first()) as RawRow | undefined
  return row ? toRound(row) : undefined
}

export async function listStudyRounds(
  db: Db,
  studyId: number,
  page: { offset: number; limit: number },
): Promise<{ items: RoundRecord[]; total: number }> {
  const [{ total }] = (await db(TABLES.reliabilityRounds)
    .where({ study_id: studyId })
    .count({ total: '*' })) as [{ total: number | string }]
  const rows = (await selectRounds(db)
    .where('rr.study_id', studyId)
    .orderBy('rr.created_at', 'desc')
    .orderBy('rr.id', 'desc')
    .offset(page.offset)
    .limit(page.limit)) as RawRow[]
  return { items: rows.map(toRound), total: Number(total) }
}

export interface NewRound {
  studyId: number
  name: string
  kind: RoundKind
  template: RoundTemplate
  templateOptions: RoundTemplateOptions
  options: RoundOptions
  repeats: number
  seed: string
  createdBy: number
}

export async function insertRound(db: Db, round: NewRound): Promise<number> {
  const [id] = await db(TABLES.reliabilityRounds).insert({
    study_id: round.studyId,
    name: round.name,
    kind: round.kind,
    template: round.template,
    template_options: JSON.stringify(round.templateOptions),
    options: JSON.stringify(round.options),
    repeats: round.repeats,
    seed: round.seed,
    created_by: round.createdBy,
  })
  return id as number
}

export async function insertRoundMembers(
  db: Db,
  roundId: number,
  members: {
    images: Array<{ imageId: number; blindCode: string }>
    raters: Array<{ userId: number; raterCode: string }>
    assignments: Array<{
      imageId: number
      raterId: number
      repetition: number
      position: number
      blindCode: string
    }>
  },
): Promise<void> {
  await insertRoundRows(
    db,
    TABLES.roundImages,
    roundId,
    members.images.map((image) => ({ image_id: image.imageId, blind_code: image.blindCode })),
  )
  await insertRoundRows(
    db,
    TABLES.roundRaters,
    roundId,
    members.raters.map((rater) => ({ user_id: rater.userId, rater_code: rater.raterCode })),
  )
  await insertRoundRows(
    db,
    TABLES.roundAssignments,
    roundId,
    members.assignments.map((assignment) => ({
      image_id: assignment.imageId,
      rater_id: assignment.raterId,
      repetition: assignment.repetition,
      position: assignment.position,
      blind_code: assignment.blindCode,
    })),
  )
}

/** Inserts a round's member rows in chunks of 500 so a large round stays within one statement's size. */
async function insertRoundRows(
  db: Db,
  table: string,
  roundId: number,
  rows: Array<Record<string, unknown>>,
): Promise<void> {
  await db.batchInsert(
    table,
    rows.map((row) => ({ round_id: roundId, ...row })),
    500,
  )
}

/** Close or reopen under the version guard; false when the version is stale. */
export async function updateRoundStatus(
  db: Db,
  id: number,
  expectedVersion: number,
  status: RoundStatus,
): Promise<boolean> {
  const changed = await db(TABLES.reliabilityRounds)
    .where({ id, version: expectedVersion })
    .update({ status, version: db.raw('version + 1'), updated_at: new Date() })
  return changed === 1
}

export interface RoundRaterRow {
  userId: number
  raterCode: string
  displayName: string
}

export async function listRoundRaters(db: Db, roundId: number): Promise<RoundRaterRow[]> {
  const rows = await db(`${TABLES.roundRaters} as rr`)
    .join(`${TABLES.users} as u`, 'u.id', 'rr.user_id')
    .where('rr.round_id', roundId)
    .orderBy('rr.rater_code')
    .select('rr.user_id', 'rr.rater_code', 'u.display_name')
  return rows.map((row) => ({
    userId: row.user_id as number,
    raterCode: row.rater_code as string,
    displayName: row.display_name as string,
  }))
}

export async function listRoundImageCodes(db: Db, roundId: number): Promise<string[]> {
  const rows = await db(TABLES.roundImages)
    .where({ round_id: roundId })
    .orderBy('blind_code')
    .select('blind_code')
  return rows.map((row) => row.blind_code as string)
}

/** One assignment with the state of its reading. */
export interface AssignmentRow {
  id: number
  roundId: number
  imageId: number
  raterId: number
  repetition: number
  position: number
  blindCode: string
  readingId: number | null
  readingStatus: string | null
  submittedAt: string | null
}

const ASSIGNMENT_COLUMNS = [
  'a.id',
  'a.round_id',
  'a.image_id',
  'a.rater_id',
  'a.repetition',
  'a.position',
  'a.blind_code',
  'a.reading_id',
  'r.status as reading_status',
  'r.submitted_at',
]

function toAssignment(row: RawRow): AssignmentRow {
  return {
    id: row.id as number,
    roundId: row.round_id as number,
    imageId: row.image_id as number,
    raterId: row.rater_id as number,
    repetition: row.repetition as number,
    position: row.position as number,
    blindCode: row.blind_code as string,
    readingId: row.reading_id as number | null,
    readingStatus: row.reading_status as string | null,
    submittedAt: toIsoDateTimeOrNull(row.submitted_at as Date | null),
  }
}

const selectAssignments = (db: Db) =>
  db(`${TABLES.roundAssignments} as a`)
    .leftJoin(`${TABLES.readings} as r`, 'r.id', 'a.reading_id')
    .select(ASSIGNMENT_COLUMNS)
    .orderBy([
      { column: 'a.round_id', order: 'asc' },
      { column: 'a.rater_id', order: 'asc' },
      { column: 'a.repetition', order: 'asc' },
      { column: 'a.position', order: 'asc' },
    ])

export async function listRoundAssignments(db: Db, roundId: number): Promise<AssignmentRow[]> {
  return ((await selectAssignments(db).where('a.round_id', roundId)) as RawRow[]).map(toAssignment)
}

/** Every assignment of a rater (all passes, all rounds), in stored order. */
export async function listRaterAssignments(db: Db, raterId: number): Promise<AssignmentRow[]> {
  return ((await selectAssignments(db).where('a.rater_id', raterId)) as RawRow[]).map(toAssignment)
}

export async function findAssignment(db: Db, id: number): Promise<AssignmentRow | undefined> {
  const row = (await selectAssignments(db).where('a.id', id).first()) as RawRow | undefined
  return row ? toAssignment(row) : undefined
}

export async function findAssignmentByReading(
  db: Db,
  readingId: number,
): Promise<AssignmentRow | undefined> {
  const row = (await selectAssignments(db).where('a.reading_id', readingId).first()) as
    RawRow | undefined
  return row ? toAssignment(row) : undefined
}

/** Locks an assignment for the rest of the transaction (two starts at once make one reading). */
export async function lockAssignment(db: Db, id: number): Promise<number | null> {
  const row = await db(TABLES.roundAssignments).where({ id }).forUpdate().first('reading_id')
  return (row?.reading_id as number | null | undefined) ?? null
}

export async function setAssignmentReading(db: Db, id: number, readingId: number): Promise<void> {
  await db(TABLES.roundAssignments).where({ id }).update({ reading_id: readingId })
}

/** Of `imageIds`, the films on visits of the study's patients, with their view. */
export async function studyFilms(
  db: Db,
  studyId: number,
  imageIds: readonly number[],
): Promise<Map<number, string>> {
  const rows = await db(`${TABLES.images} as i`)
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .join(`${TABLES.studyPatients} as sp`, 'sp.patient_id', 'v.patient_id')
    .where('sp.study_id', studyId)
    .whereIn('i.id', imageIds)
    .select('i.id', 'i.view')
  return new Map(rows.map((row) => [row.id as number, row.view as string]))
}

/**
 * The lateral films of a study's patients, by study code, then visit in time order, then film:
 * what a new round may include, in one statement.
 */
export async function listStudyLateralFilms(
  db: Db,
  studyId: number,
): Promise<RoundFilmCandidate[]> {
  // Each visit's place among all of its patient's visits (same-day visits in the order entered),
  // as the patient's page numbers them.
  const numberedVisits = db(`${TABLES.visits} as nv`)
    .select(
      'nv.id',
      'nv.patient_id',
      'nv.kind',
      db.raw('ROW_NUMBER() OVER (PARTITION BY nv.patient_id ORDER BY nv.visit_date, nv.id) AS seq'),
    )
    .whereIn(
      'nv.patient_id',
      db(TABLES.studyPatients).where('study_id', studyId).select('patient_id'),
    )
    .as('v')
  const rows = (await db(`${TABLES.images} as i`)
    .join(numberedVisits, 'v.id', 'i.visit_id')
    .join(`${TABLES.patients} as p`, 'p.id', 'v.patient_id')
    .whereIn(
      'i.view',
      IMAGE_VIEWS.filter((view) => view.startsWith('lateral')),
    )
    .orderBy([{ column: 'p.study_code' }, { column: 'v.seq' }, { column: 'i.id' }])
    .select('i.id', 'i.view', 'p.study_code', 'v.kind', 'v.seq')) as Array<{
    id: number
    view: ImageView
    study_code: string
    kind: VisitKind
    seq: number | string
  }>
  return rows.map((row) => ({
    imageId: row.id,
    studyCode: row.study_code,
    visitKind: row.kind,
    visitSequence: Number(row.seq),
    view: row.view,
  }))
}

/** Active accounts among `ids` with their role. */
export async function activeUserRoles(db: Db, ids: readonly number[]): Promise<Map<number, Role>> {
  const rows = await db(TABLES.users)
    .whereIn('id', ids)
    .where({ active: true })
    .select('id', 'role')
  return new Map(rows.map((row) => [row.id as number, row.role as Role]))
}

/** Submitted readings of a round with the assignment each answers (for the statistics). */
export async function listRoundReadings(
  db: Db,
  roundId: number,
): Promise<Array<{ imageId: number; raterId: number; repetition: number; results: unknown }>> {
  const rows = await db(`${TABLES.roundAssignments} as a`)
    .join(`${TABLES.readings} as r`, 'r.id', 'a.reading_id')
    .where('a.round_id', roundId)
    .where('r.status', 'submitted')
    .select('a.image_id', 'a.rater_id', 'a.repetition', 'r.results')
  return rows.map((row) => ({
    imageId: row.image_id as number,
    raterId: row.rater_id as number,
    repetition: row.repetition as number,
    results: fromResultsColumn(row.results),
  }))
}

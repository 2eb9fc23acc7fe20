import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { toBoolean, toIsoDate, toIsoDateTime } from './rows'
import type { Sex } from '../../shared/types/domain'
import type { PatientSortField } from '../../shared/types/api'

export interface PatientRecord {
  id: number
  recordNumber: string
  familyName: string
  givenName: string
  birthDate: string
  sex: Sex
  studyCode: string
  osteoporosis: boolean
  notes: string | null
  responsibleSurgeonId: number | null
  responsibleSurgeonName: string | null
  visitCount: number
  firstVisitDate: string | null
  lastVisitDate: string | null
  version: number
  createdAt: string
  updatedAt: string
}

interface PatientRow {
  id: number
  record_number: string
  family_name: string
  given_name: string
  birth_date: Date
  sex: Sex
  study_code: string
  osteoporosis: number
  notes: string | null
  responsible_surgeon_id: number | null
  responsible_surgeon_name: string | null
  visit_count: number | string
  first_visit_date: Date | null
  last_visit_date: Date | null
  version: number
  created_at: Date
  updated_at: Date
}

function toPatient(row: PatientRow): PatientRecord {
  return {
    id: row.id,
    recordNumber: row.record_number,
    familyName: row.family_name,
    givenName: row.given_name,
    birthDate: toIsoDate(row.birth_date),
    sex: row.sex,
    studyCode: row.study_code,
    osteoporosis: toBoolean(row.osteoporosis),
    notes: row.notes,
    responsibleSurgeonId: row.responsible_surgeon_id,
    responsibleSurgeonName: row.responsible_surgeon_name,
    visitCount: Number(row.visit_count),
    firstVisitDate: row.first_visit_date ? toIsoDate(row.first_visit_date) : null,
    lastVisitDate: row.last_visit_date ? toIsoDate(row.last_visit_date) : null,
    version: row.version,
    createdAt: toIsoDateTime(row.created_at),
    updatedAt: toIsoDateTime(row.updated_at),
  }
}

const SORT_COLUMNS: Record<PatientSortField, string> = {
  familyName: 'p.family_name',
  recordNumber: 'p.record_number',
  birthDate: 'p.birth_date',
  studyCode: 'p.study_code',
  updatedAt: 'p.updated_at',
}

/**
 * A patient's columns with its visit figures (correlated subqueries on the visits' (patient_id,
 * visit_date) index, so only the rows asked for are counted: a derived table grouped over every
 * visit was built in full on each request) and the responsible surgeon's name. `p` is patients.
 */
function withPatientDetails(db: Db, query: Knex.QueryBuilder): Knex.QueryBuilder {
  const visitsOf = `FROM ${TABLES.visits} AS v WHERE v.patient_id = p.id`
  return query
    .leftJoin(`${TABLES.users} as rs`, 'rs.id', 'p.responsible_surgeon_id')
    .select(
      'p.id',
      'p.record_number',
      'p.family_name',
      'p.given_name',
      'p.birth_date',
      'p.sex',
      'p.study_code',
      'p.osteoporosis',
      'p.notes',
      'p.responsible_surgeon_id',
      'rs.display_name as responsible_surgeon_name',
      'p.version',
      'p.created_at',
      'p.updated_at',
      db.raw(`(SELECT COUNT(*) ${visitsOf}) AS visit_count`),
      db.raw(`(SELECT MIN(v.visit_date) ${visitsOf}) AS first_visit_date`),
      db.raw(`(SELECT MAX(v.visit_date) ${visitsOf}) AS last_visit_date`),
    )
}

/** Limits a query to patients of studies the researcher belongs to. */
function scopeToResearcher(db: Db, query: Knex.QueryBuilder, researcherId: number): void {
  query.whereIn(
    'p.id',
    db(`${TABLES.studyPatients} as sp`)
      .join(`${TABLES.studyMembers} as sm`, 'sm.study_id', 'sp.study_id')
      .where('sm.user_id', researcherId)
      .select('sp.patient_id'),
  )
}

export interface PatientSearch {
  q?: string
  /** Search only the pseudonym (researchers must not be able to probe names). */
  studyCodeOnly: boolean
  researcherId?: number
  /** Only the patients of this study. */
  studyId?: number
  sort: PatientSortField
  order: 'asc' | 'desc'
  offset: number
  limit: number
}

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`)
}

export async function searchPatients(
  db: Db,
  search: PatientSearch,
): Promise<{ items: PatientRecord[]; total: number }> {
  // Filtered, counted and paged on the patients table alone; the joins are made for the page.
  const query = db(`${TABLES.patients} as p`)
  if (search.researcherId !== undefined) scopeToResearcher(db, query, search.researcherId)
  if (search.studyId !== undefined) {
    query.whereIn(
      'p.id',
      db(TABLES.studyPatients).where('study_id', search.studyId).select('patient_id'),
    )
  }
  const q = search.q?.trim()
  if (q) {
    const like = `%${escapeLike(q)}%`
    query.where((where) => {
      where.whereILike('p.study_code', like)
      if (!search.studyCodeOnly) {
        where
          .orWhereILike('p.record_number', like)
          .orWhereILike('p.family_name', like)
          .orWhereILike('p.given_name', like)
          .orWhereRaw("CONCAT(p.given_name, ' ', p.family_name) LIKE ?", [like])
          .orWhereRaw("CONCAT(p.family_name, ', ', p.given_name) LIKE ?", [like])
      }
    })
  }
  // The page's ids in a derived table (ordered on the patients table alone, which an index on
  // the sort column serves), joined to each patient's details, with the count of every match
  // as a scalar subquery that MariaDB evaluates once: one statement, one round trip, for the
  // page and its total. Only a page past the end (no row to carry the total) counts again.
  const order = (builder: Knex.QueryBuilder) =>
    builder.orderBy(SORT_COLUMNS[search.sort], search.order).orderBy('p.id', 'asc')
  const page = order(query.clone().select('p.id'))
    .offset(search.offset)
    .limit(search.limit)
    .as('page')
  const matching = query.clone().count({ total: '*' })
  // The whole list reads the total the triggers keep (migration 20261220090000) rather than
  // counting every patient; a filtered list counts its matches.
  const whole = search.researcherId === undefined && search.studyId === undefined && !q
  const totalOfMatches = whole
    ? db(TABLES.patientTotal).where({ id: 1 }).select('total')
    : matching.clone()
  const rows = (await order(
    withPatientDetails(db, db.from(page).join(`${TABLES.patients} as p`, 'p.id', 'page.id')).select(
      totalOfMatches.as('total_matching'),
    ),
  )) as Array<PatientRow & { total_matching: number | string }>
  const items = rows.map(toPatient)
  if (rows.length > 0) return { items, total: Number(rows[0]!.total_matching) }
  // No row: nothing matches, or the page lies past the end and only a count can say how many do.
  if (search.offset === 0) return { items, total: 0 }
  const [{ total }] = (await matching) as [{ total: number | string }]
  return { items, total: Number(total) }
}

export async function findPatient(
  db: Db,
  id: number,
  researcherId?: number,
): Promise<PatientRecord | undefined> {
  const query = withPatientDetails(db, db(`${TABLES.patients} as p`)).where('p.id', id)
  if (researcherId !== undefined) scopeToResearcher(db, query, researcherId)
  const row = (await query.first()) as PatientRow | undefined
  return row ? toPatient(row) : undefined
}

export interface PatientWrite {
  recordNumber: string
  familyName: string
  givenName: string
  birthDate: string
  sex: Sex
  osteoporosis: boolean
  notes: string | null
  responsibleSurgeonId?: number | null
}

export async function insertPatient(
  db: Db,
  patient: PatientWrite & { studyCode: string; createdBy: number },
): Promise<number> {
  const [id] = await db(TABLES.patients).insert({
    record_number: patient.recordNumber,
    family_name: patient.familyName,
    given_name: patient.givenName,
    birth_date: patient.birthDate,
    sex: patient.sex,
    study_code: patient.studyCode,
    osteoporosis: patient.osteoporosis,
    notes: patient.notes,
    responsible_surgeon_id: patient.responsibleSurgeonId ?? null,
    created_by: patient.createdBy,
  })
  return id as number
}

export async function findPatientIdByRecordNumber(
  db: Db,
  recordNumber: string,
): Promise<number | undefined> {
  const row = await db(TABLES.patients).where({ record_number: recordNumber }).first('id')
  return row?.id as number | undefined
}

export async function studyCodeExists(db: Db, studyCode: string): Promise<boolean> {
  return (await db(TABLES.patients).where({ study_code: studyCode }).first('id')) !== undefined
}

/** Updates only when the stored version matches; returns whether a row changed. */
export async function updatePatient(
  db: Db,
  id: number,
  expectedVersion: number,
  patch: Partial<PatientWrite>,
): Promise<boolean> {
  const columns: Record<string, unknown> = {}
  if (patch.recordNumber !== undefined) columns.record_number = patch.recordNumber
  if (patch.familyName !== undefined) columns.family_name = patch.familyName
  if (patch.givenName !== undefined) columns.given_name = patch.givenName
  if (patch.birthDate !== undefined) columns.birth_date = patch.birthDate
  if (patch.sex !== undefined) columns.sex = patch.sex
  if (patch.osteoporosis !== undefined) columns.osteoporosis = patch.osteoporosis
  if (patch.notes !== undefined) columns.notes = patch.notes
  if (patch.responsibleSurgeonId !== undefined)
    columns.responsible_surgeon_id = patch.responsibleSurgeonId
  const changed = await db(TABLES.patients)
    .where({ id, version: expectedVersion })
    .update({ ...columns, version: db.raw('version + 1'), updated_at: new Date() })
  return changed === 1
}

import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { whereHeldBack } from './images'
import { toBoolean, toIsoDateTime } from './rows'
import type { StudyMember, StudySummary } from '../../shared/types/studies'

interface StudyRow {
  id: number
  name: string
  description: string | null
  note: string | null
  version: number
  created_at: Date
  updated_at: Date
  patient_count: number | string
  film_count: number | string
  held_back_film_count: number | string
  reading_count: number | string
  member_count: number | string
}

function toStudySummary(row: StudyRow): StudySummary {
  return {
    id: row.id,
    name: row.name,
    description: row.description,
    note: row.note,
    patientCount: Number(row.patient_count),
    filmCount: Number(row.film_count),
    heldBackFilmCount: Number(row.held_back_film_count),
    readingCount: Number(row.reading_count),
    memberCount: Number(row.member_count),
    version: row.version,
    createdAt: toIsoDateTime(row.created_at),
    updatedAt: toIsoDateTime(row.updated_at),
  }
}

/** Studies with their counts; films and readings through the study patients' visits. */
function selectStudies(db: Db): Knex.QueryBuilder {
  const patients = db(`${TABLES.studyPatients} as sp`).whereRaw('sp.study_id = s.id').count('*')
  const films = db(`${TABLES.images} as i`)
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .join(`${TABLES.studyPatients} as sp`, 'sp.patient_id', 'v.patient_id')
    .whereRaw('sp.study_id = s.id')
    .count('*')
  const heldBackFilms = whereHeldBack(
    db(`${TABLES.images} as i`)
      .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
      .join(`${TABLES.studyPatients} as sp`, 'sp.patient_id', 'v.patient_id')
      .whereRaw('sp.study_id = s.id'),
    'i',
  ).count('*')
  // Readings of a re-reading round are blinded and stay out of every clinical count.
  const readings = db(`${TABLES.readings} as r`)
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .join(`${TABLES.studyPatients} as sp`, 'sp.patient_id', 'v.patient_id')
    .whereRaw('sp.study_id = s.id')
    .where('r.blinded', false)
    .count('*')
  const members = db(`${TABLES.studyMembers} as sm`).whereRaw('sm.study_id = s.id').count('*')
  return db(`${TABLES.studies} as s`).select(
    's.id',
    's.name',
    's.description',
    's.note',
    's.version',
    's.created_at',
    's.updated_at',
    patients.as('patient_count'),
    films.as('film_count'),
    heldBackFilms.as('held_back_film_count'),
    readings.as('reading_count'),
    members.as('member_count'),
  )
}

/** Limits a query to the studies the user belongs to. */
function scopeToMember(db: Db, query: Knex.QueryBuilder, memberId: number): void {
  query.whereIn('s.id', db(TABLES.studyMembers).where('user_id', memberId).select('study_id'))
}

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`)
}

export interface StudySearch {
  q?: string
  /** Only the studies this researcher belongs to. */
  memberId?: number
  offset: number
  limit: number
}

export async function searchStudies(
  db: Db,
  search: StudySearch,
): Promise<{ items: StudySummary[]; total: number }> {
  const filtered = db(`${TABLES.studies} as s`)
  if (search.memberId !== undefined) scopeToMember(db, filtered, search.memberId)
  const q = search.q?.trim()
  if (q) filtered.whereILike('s.name', `%${escapeLike(q)}%`)
  const [{ total }] = (await filtered.clone().count({ total: '*' })) as [{ total: number | string }]
  const query = selectStudies(db).whereIn('s.id', filtered.clone().select('s.id'))
  const rows = (await query
    .orderBy('s.name', 'asc')
    .orderBy('s.id', 'asc')
    .offset(search.offset)
    .limit(search.limit)) as StudyRow[]
  return { items: rows.map(toStudySummary), total: Number(total) }
}

export async function findStudy(
  db: Db,
  id: number,
  memberId?: number,
): Promise<StudySummary | undefined> {
  if (!Number.isSafeInteger(id)) return undefined
  const query = selectStudies(db).where('s.id', id)
  if (memberId !== undefined) scopeToMember(db, query, memberId)
  const row = (await query.first()) as StudyRow | undefined
  return row ? toStudySummary(row) : undefined
}

export async function findStudyIdByName(db: Db, name: string): Promise<number | undefined> {
  const row = await db(TABLES.studies).where({ name }).first('id')
  return row?.id as number | undefined
}

export async function listStudyMembers(db: Db, studyId: number): Promise<StudyMember[]> {
  const rows = await db(`${TABLES.studyMembers} as sm`)
    .join(`${TABLES.users} as u`, 'u.id', 'sm.user_id')
    .where('sm.study_id', studyId)
    .select('u.id', 'u.display_name', 'u.email', 'u.active')
    .orderBy('u.display_name', 'asc')
  return rows.map((row) => ({
    id: row.id as number,
    displayName: row.display_name as string,
    email: row.email as string,
    active: toBoolean(row.active as number),
  }))
}

export interface StudyWrite {
  name: string
  description: string | null
  note: string | null
}

export async function insertStudy(
  db: Db,
  study: StudyWrite & { createdBy: number },
): Promise<number> {
  const [id] = await db(TABLES.studies).insert({
    name: study.name,
    description: study.description,
    note: study.note,
    created_by: study.createdBy,
  })
  return id as number
}

/** Updates (and bumps the version) only when the stored version matches. */
export async function updateStudy(
  db: Db,
  id: number,
  expectedVersion: number,
  patch: Partial<StudyWrite>,
): Promise<boolean> {
  const columns: Record<string, unknown> = {}
  if (patch.name !== undefined) columns.name = patch.name
  if (patch.description !== undefined) columns.description = patch.description
  if (patch.note !== undefined) columns.note = patch.note
  const changed = await db(TABLES.studies)
    .where({ id, version: expectedVersion })
    .update({ ...columns, version: db.raw('version + 1'), updated_at: new Date() })
  return changed === 1
}

async function replaceLinks(
  db: Db,
  table: string,
  column: 'patient_id' | 'user_id',
  studyId: number,
  ids: readonly number[],
): Promise<{ added: number; removed: number }> {
  const current = new Set(
    (await db(table).where({ study_id: studyId }).select(column)).map(
      (row) => row[column] as number,
    ),
  )
  const wanted = new Set(ids)
  const toAdd = ids.filter((id) => !current.has(id))
  const toRemove = [...current].filter((id) => !wanted.has(id))
  if (toRemove.length > 0) {
    await db(table).where({ study_id: studyId }).whereIn(column, toRemove).delete()
  }
  for (let start = 0; start < toAdd.length; start += 500) {
    await db(table).insert(
      toAdd.slice(start, start + 500).map((id) => ({ study_id: studyId, [column]: id })),
    )
  }
  return { added: toAdd.length, removed: toRemove.length }
}

export const replaceStudyPatients = (db: Db, studyId: number, patientIds: readonly number[]) =>
  replaceLinks(db, TABLES.studyPatients, 'patient_id', studyId, patientIds)

export const replaceStudyMembers = (db: Db, studyId: number, userIds: readonly number[]) =>
  replaceLinks(db, TABLES.studyMembers, 'user_id', studyId, userIds)

/** The ids among `ids` that name an existing patient. */
export async function existingPatientIds(db: Db, ids: readonly number[]): Promise<Set<number>> {
  if (ids.length === 0) return new Set()
  const rows = await db(TABLES.patients).whereIn('id', ids).select('id')
  return new Set(rows.map((row) => row.id as number))
}

/** The ids among `ids` that name a researcher account (active or not). */
export async function researcherIds(db: Db, ids: readonly number[]): Promise<Set<number>> {
  if (ids.length === 0) return new Set()
  const rows = await db(TABLES.users).whereIn('id', ids).where({ role: 'researcher' }).select('id')
  return new Set(rows.map((row) => row.id as number))
}

/** Active researcher accounts, for choosing members. */
export async function listResearchers(db: Db): Promise<StudyMember[]> {
  const rows = await db(TABLES.users)
    .where({ role: 'researcher' })
    .select('id', 'display_name', 'email', 'active')
    .orderBy('display_name', 'asc')
  return rows.map((row) => ({
    id: row.id as number,
    displayName: row.display_name as string,
    email: row.email as string,
    active: toBoolean(row.active as number),
  }))
}

export async function listStudyPatientIds(db: Db, studyId: number): Promise<number[]> {
  const rows = await db(TABLES.studyPatients)
    .where({ study_id: studyId })
    .orderBy('patient_id')
    .select('patient_id')
  return rows.map((row) => row.patient_id as number)
}

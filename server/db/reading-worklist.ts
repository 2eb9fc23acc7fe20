import type { Db } from './knex'
import { TABLES } from './tables'
import { parseJson, toIsoDate, toIsoDateTimeOrNull } from './rows'
import { SUPERSEDED_BY } from './readings'
import { whereReleased } from './images'
import type { ReadingStatus, ReadingTemplate, VisitKind } from '../../shared/types/domain'
import type { ReadingSortField, ReadingSummary } from '../../shared/types/readings'
import type { TemplateOptions } from '../../shared/readings/templates'

/** A worklist row as stored, the patient's names apart (the service decides who sees them). */
export interface ReadingListRecord extends Omit<
  ReadingSummary,
  'patientName' | 'recordNumber' | 'visitDate'
> {
  familyName: string
  givenName: string
  recordNumber: string
  visitDate: string
}

export interface ReadingListFilter {
  statuses?: readonly ReadingStatus[]
  raterId?: number
  /** Submitted readings sent to this surgeon or to nobody in particular, not their own. */
  awaitingUserId?: number
  signedById?: number
  returnedById?: number
  patientId?: number
  /** Researchers: only patients of the studies they belong to. */
  researcherId?: number
  sort: ReadingSortField
  order: 'asc' | 'desc'
  offset: number
  limit: number
}

const SORT_COLUMNS: Record<ReadingSortField, string> = {
  submittedAt: 'r.submitted_at',
  signedAt: 'r.signed_at',
  updatedAt: 'r.updated_at',
  createdAt: 'r.created_at',
  id: 'r.id',
}

type RawRow = Record<string, unknown>

function toRecord(row: RawRow): ReadingListRecord {
  return {
    id: row.id as number,
    imageId: row.image_id as number,
    template: row.template as ReadingTemplate,
    options: parseJson<TemplateOptions>(row.template_options) ?? {},
    status: row.status as ReadingStatus,
    version: row.version as number,
    raterId: row.rater_id as number,
    raterName: row.rater_name as string,
    patientId: row.patient_id as number,
    studyCode: row.study_code as string,
    familyName: row.family_name as string,
    givenName: row.given_name as string,
    recordNumber: row.record_number as string,
    visitId: row.visit_id as number,
    visitKind: row.visit_kind as VisitKind,
    visitDate: toIsoDate(row.visit_date as Date),
    reviewerId: row.reviewer_id as number | null,
    submittedAt: toIsoDateTimeOrNull(row.submitted_at as Date | null),
    signedAt: toIsoDateTimeOrNull(row.signed_at as Date | null),
    signedByName: (row.signed_by_name as string | null) ?? null,
    returnedAt: toIsoDateTimeOrNull(row.returned_at as Date | null),
    returnedByName: (row.returned_by_name as string | null) ?? null,
    returnComment: row.return_comment as string | null,
    supersedesId: row.supersedes_id as number | null,
    supersededById: (row.superseded_by_id as number | null) ?? null,
    createdAt: toIsoDateTimeOrNull(row.created_at as Date | null),
    updatedAt: toIsoDateTimeOrNull(row.updated_at as Date | null),
  }
}

/** Readings with their patient and visit, filtered, sorted and paged; blinded ones never. */
export async function listReadingRecords(
  db: Db,
  filter: ReadingListFilter,
): Promise<{ items: ReadingListRecord[]; total: number }> {
  const query = db(`${TABLES.readings} as r`)
    .join(`${TABLES.users} as u`, 'u.id', 'r.rater_id')
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .join(`${TABLES.patients} as p`, 'p.id', 'v.patient_id')
    .leftJoin(`${TABLES.users} as signer`, 'signer.id', 'r.signed_by')
    .leftJoin(`${TABLES.users} as returner`, 'returner.id', 'r.returned_by')
    // Blinded re-readings belong to reliability rounds, not to anyone's worklist.
    .where('r.blinded', false)
  if (filter.statuses && filter.statuses.length > 0) query.whereIn('r.status', filter.statuses)
  if (filter.raterId !== undefined) query.where('r.rater_id', filter.raterId)
  if (filter.signedById !== undefined) query.where('r.signed_by', filter.signedById)
  if (filter.returnedById !== undefined) query.where('r.returned_by', filter.returnedById)
  if (filter.patientId !== undefined) query.where('p.id', filter.patientId)
  if (filter.awaitingUserId !== undefined) {
    const me = filter.awaitingUserId
    query
      .where('r.status', 'submitted')
      .whereNot('r.rater_id', me)
      .where((where) => where.where('r.reviewer_id', me).orWhereNull('r.reviewer_id'))
  }
  if (filter.researcherId !== undefined) {
    query.whereIn(
      'p.id',
      db(`${TABLES.studyPatients} as sp`)
        .join(`${TABLES.studyMembers} as sm`, 'sm.study_id', 'sp.study_id')
        .where('sm.user_id', filter.researcherId)
        .select('sp.patient_id'),
    )
    // A researcher opens no reading of a film held back for its pixels, so none is listed.
    whereReleased(query, 'i')
  }
  const [{ total }] = (await query.clone().count({ total: '*' })) as [{ total: number | string }]
  const rows = (await query
    .select(
      'r.id',
      'r.image_id',
      'r.template',
      'r.template_options',
      'r.status',
      'r.version',
      'r.rater_id',
      'u.display_name as rater_name',
      'p.id as patient_id',
      'p.study_code',
      'p.family_name',
      'p.given_name',
      'p.record_number',
      'v.id as visit_id',
      'v.kind as visit_kind',
      'v.visit_date',
      'r.reviewer_id',
      'r.submitted_at',
      'r.signed_at',
      'signer.display_name as signed_by_name',
      'r.returned_at',
      'returner.display_name as returned_by_name',
      'r.return_comment',
      'r.supersedes_id',
      db.raw(SUPERSEDED_BY),
      'r.created_at',
      'r.updated_at',
    )
    .orderBy(SORT_COLUMNS[filter.sort], filter.order)
    .orderBy('r.id', filter.order)
    .offset(filter.offset)
    .limit(filter.limit)) as RawRow[]
  return { items: rows.map(toRecord), total: Number(total) }
}

/** What a mail about a reading may say of its patient and visit: no name, no record number. */
export interface ReadingMailContext {
  studyCode: string
  visitKind: VisitKind
  visitDate: string
  responsibleSurgeonId: number | null
}

export async function findReadingMailContext(
  db: Db,
  readingId: number,
): Promise<ReadingMailContext | undefined> {
  const row = (await db(`${TABLES.readings} as r`)
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .join(`${TABLES.patients} as p`, 'p.id', 'v.patient_id')
    .select('p.study_code', 'v.kind', 'v.visit_date', 'p.responsible_surgeon_id')
    .where('r.id', readingId)
    .first()) as RawRow | undefined
  if (!row) return undefined
  return {
    studyCode: row.study_code as string,
    visitKind: row.kind as VisitKind,
    visitDate: toIsoDate(row.visit_date as Date),
    responsibleSurgeonId: row.responsible_surgeon_id as number | null,
  }
}

/** The responsible surgeon of the patient a visit belongs to, if one is recorded. */
export async function findResponsibleSurgeonOfVisit(
  db: Db,
  visitId: number,
): Promise<number | null> {
  const row = (await db(`${TABLES.visits} as v`)
    .join(`${TABLES.patients} as p`, 'p.id', 'v.patient_id')
    .select('p.responsible_surgeon_id')
    .where('v.id', visitId)
    .first()) as RawRow | undefined
  return (row?.responsible_surgeon_id as number | null | undefined) ?? null
}

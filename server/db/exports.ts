import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { parseJson, toIsoDate } from './rows'
import type { ExportReading } from '../exports/export-columns'
import type { ReadingCalibration, ReadingResults } from '../../shared/types/readings'
import type { ReadingTemplate, Sex, VisitKind } from '../../shared/types/domain'

export interface ExportFilter {
  studyId?: number
  /** Only patients of studies this researcher belongs to. */
  researcherId?: number
  visitKinds?: VisitKind[]
  templates?: ReadingTemplate[]
  statuses?: string[]
}

type RawRow = Record<string, unknown>

function toExportReading(row: RawRow): ExportReading {
  return {
    readingId: row.id as number,
    imageId: row.image_id as number,
    template: row.template as ReadingTemplate,
    status: row.status as string,
    engineVersion: row.engine_version as string,
    calibration: parseJson<ReadingCalibration>(row.calibration) ?? {
      mmPerPixel: null,
      source: 'none',
    },
    results: parseJson<ReadingResults>(row.results) as ReadingResults,
    raterId: row.rater_id as number,
    raterName: row.rater_name as string,
    visitKind: row.kind as VisitKind,
    visitDate: toIsoDate(row.visit_date as Date),
    studyCode: row.study_code as string,
    sex: row.sex as Sex,
    birthDate: toIsoDate(row.birth_date as Date),
    recordNumber: row.record_number as string,
    familyName: row.family_name as string,
    givenName: row.given_name as string,
    firstPostOpDate: row.first_post_op_date ? toIsoDate(row.first_post_op_date as Date) : null,
  }
}

/**
 * The readings an export covers, oldest visit first within each patient. Readings of
 * re-reading rounds (blinded) never enter a clinical export.
 */
function exportQuery(db: Db, filter: ExportFilter): Knex.QueryBuilder {
  const firstPostOp = db(TABLES.visits)
    .where('kind', 'post-op')
    .groupBy('patient_id')
    .select('patient_id')
    .min({ first_post_op_date: 'visit_date' })
    .as('po')
  const query = db(`${TABLES.readings} as r`)
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .join(`${TABLES.patients} as p`, 'p.id', 'v.patient_id')
    .join(`${TABLES.users} as u`, 'u.id', 'r.rater_id')
    .leftJoin(firstPostOp, 'po.patient_id', 'p.id')
    .where('r.blinded', false)
    .select(
      'r.id',
      'r.image_id',
      'r.template',
      'r.status',
      'r.engine_version',
      'r.calibration',
      'r.results',
      'r.rater_id',
      'u.display_name as rater_name',
      'v.kind',
      'v.visit_date',
      'p.study_code',
      'p.sex',
      'p.birth_date',
      'p.record_number',
      'p.family_name',
      'p.given_name',
      'po.first_post_op_date',
    )
  if (filter.studyId !== undefined) {
    query.whereIn(
      'p.id',
      db(TABLES.studyPatients).where('study_id', filter.studyId).select('patient_id'),
    )
  }
  if (filter.researcherId !== undefined) {
    query.whereIn(
      'p.id',
      db(`${TABLES.studyPatients} as sp`)
        .join(`${TABLES.studyMembers} as sm`, 'sm.study_id', 'sp.study_id')
        .where('sm.user_id', filter.researcherId)
        .select('sp.patient_id'),
    )
  }
  if (filter.visitKinds?.length) query.whereIn('v.kind', filter.visitKinds)
  if (filter.templates?.length) query.whereIn('r.template', filter.templates)
  if (filter.statuses?.length) query.whereIn('r.status', filter.statuses)
  return query.orderBy([
    { column: 'p.study_code', order: 'asc' },
    { column: 'v.visit_date', order: 'asc' },
    { column: 'r.id', order: 'asc' },
  ])
}

/** Streams the readings one by one, so an export of any size holds one row at a time. */
export async function* streamExportReadings(
  db: Db,
  filter: ExportFilter,
): AsyncGenerator<ExportReading> {
  const stream = exportQuery(db, filter).stream()
  try {
    for await (const row of stream) yield toExportReading(row as RawRow)
  } finally {
    stream.destroy()
  }
}

/** Readings and output rows (one per measured segment, at least one per reading) of an export. */
export async function countExportRows(
  db: Db,
  filter: ExportFilter,
): Promise<{ readings: number; rows: number }> {
  const row = (await db
    .from(
      exportQuery(db, filter)
        .clearSelect()
        .clearOrder()
        .select(
          db.raw(
            "GREATEST(1, COALESCE(JSON_LENGTH(JSON_KEYS(r.results, '$.measurements.segments')), 0)) as segment_rows",
          ),
        )
        .as('e'),
    )
    .count({ readings: '*' })
    .sum({ rows: 'segment_rows' })
    .first()) as { readings: number | string; rows: number | string | null }
  return { readings: Number(row.readings), rows: Number(row.rows ?? 0) }
}

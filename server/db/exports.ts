import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { fromResultsColumn } from './reading-results-columns'
import { parseJson, toIsoDate } from './rows'
import type { ExportReading } from '../exports/export-columns'
import type { ReadingCalibration } from '../../shared/types/readings'
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

/** Longest an export's query may stream: a very large export to a slow reader, with room. */
const EXPORT_STATEMENT_MS = 10 * 60_000
/** Readings buffered ahead of the writer: a few MB, flat however large the export. */
const STREAM_ROWS_AHEAD = 250

function toExportReading(row: RawRow, raterNames: ReadonlyMap<number, string>): ExportReading {
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
    results: fromResultsColumn(row.results),
    raterId: row.rater_id as number,
    raterName: raterNames.get(row.rater_id as number) ?? '',
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
 * The readings an export covers. Readings of
 * re-reading rounds (blinded) never enter a clinical export.
 */
function exportQuery(db: Db, filter: ExportFilter): Knex.QueryBuilder {
  // Per row through the visits' patient index; a grouped derived table would be joined unindexed.
  const firstPostOp = db(`${TABLES.visits} as pv`)
    .whereRaw('pv.patient_id = p.id')
    .where('pv.kind', 'post-op')
    .min('pv.visit_date')
  const query = db(`${TABLES.readings} as r`)
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .join(`${TABLES.patients} as p`, 'p.id', 'v.patient_id')
    .where('r.blinded', false)
    .select(
      'r.id',
      'r.image_id',
      'r.template',
      'r.status',
      'r.engine_version',
      'r.calibration',
      // The results without their intervals, which are stored apart (see
      // server/db/reading-results-columns.ts) and which no export column reads.
      'r.results',
      'r.rater_id',
      'v.kind',
      'v.visit_date',
      'p.study_code',
      'p.sex',
      'p.birth_date',
      'p.record_number',
      'p.family_name',
      'p.given_name',
      firstPostOp.as('first_post_op_date'),
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
  // No ORDER BY: any order the joins cannot deliver by an index makes MariaDB copy every row,
  // results included, into a temporary table and sort it before the first byte leaves. Rows come
  // in the order MariaDB walks the films; each row carries its reading and film ids.
  return query
}

/**
 * Streams the readings one by one, so an export of any size holds one row at a time. Rater
 * names come from one small lookup rather than a join, which would let MariaDB drive the query
 * from the users table and sort every row, results included, in a temporary table.
 */
export async function* streamExportReadings(
  db: Db,
  filter: ExportFilter,
): AsyncGenerator<ExportReading> {
  const raterNames = new Map<number, string>(
    (await db(TABLES.users).select('id', 'display_name')).map((user) => [
      user.id as number,
      user.display_name as string,
    ]),
  )
  // An export streams for as long as its reader takes to download it, far beyond the API's
  // statement timeout, which would cut it off midway; it gets a limit of its own (both the
  // client's and MariaDB's, see server/db/timeouts.ts).
  const { sql, bindings } = exportQuery(db, filter).toSQL().toNative()
  const stream = db
    .raw(`SET STATEMENT max_statement_time = ${EXPORT_STATEMENT_MS / 1000} FOR ${sql}`, bindings)
    .options({ timeout: EXPORT_STATEMENT_MS })
    // More rows buffered than the default 16, so MariaDB can keep producing while Node writes.
    .stream({ highWaterMark: STREAM_ROWS_AHEAD })
  try {
    for await (const row of stream) yield toExportReading(row as RawRow, raterNames)
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

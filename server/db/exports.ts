import { pipeline, Transform, type Readable } from 'node:stream'
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
  /** One of `count` disjoint shares of the films (by id), for exports read in parallel. */
  share?: { count: number; index: number }
}

type RawRow = Record<string, unknown>

/** Longest an export's query may stream: a very large export to a slow reader, with room. */
const EXPORT_STATEMENT_MS = 10 * 60_000
/**
 * Readings buffered ahead of the writer, per stage: enough that MariaDB keeps producing while
 * Node works, few enough that their parsed results die young (250 made the export bench ~8 %
 * slower, from the garbage collector's copying).
 */
const STREAM_ROWS_AHEAD = 32

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
    visitDate: toIsoDate(row.visit_date as string),
    studyCode: row.study_code as string,
    sex: row.sex as Sex,
    birthDate: toIsoDate(row.birth_date as string),
    recordNumber: row.record_number as string,
    familyName: row.family_name as string,
    givenName: row.given_name as string,
    firstPostOpDate: row.first_post_op_date ? toIsoDate(row.first_post_op_date as string) : null,
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
  // By film, which MariaDB filters before it fetches a reading's results: a share by reading
  // id would have every share read every reading's results and then drop most of them.
  if (filter.share) query.whereRaw('i.id MOD ? = ?', [filter.share.count, filter.share.index])
  // No ORDER BY: any order the joins cannot deliver by an index makes MariaDB copy every row,
  // results included, into a temporary table and sort it before the first byte leaves. Rows come
  // in the order MariaDB walks the films; each row carries its reading and film ids.
  return query
}

/** The part of a mysql2 connection an export uses: a streamed query, and closing it. */
interface StreamingConnection {
  query(
    options: Record<string, unknown>,
    values: readonly unknown[],
  ): { stream(options: object): Readable }
  destroy(): void
}

/**
 * The readings of an export as a stream, one object per reading, which the caller pipes on and
 * destroys when it stops early. Stream stages rather than an async generator per row: an export
 * of 20 000 readings otherwise pays a promise and a microtask per reading at every layer. Rater
 * names come from one small lookup rather than a join, which would let MariaDB drive the query
 * from the users table and sort every row, results included, in a temporary table.
 */
export async function openExportReadingStream(db: Db, filter: ExportFilter): Promise<Readable> {
  const raterNames = new Map<number, string>(
    (await db(TABLES.users).select('id', 'display_name')).map((user) => [
      user.id as number,
      user.display_name as string,
    ]),
  )
  const { sql, bindings } = exportQuery(db, filter).toSQL().toNative()
  // A connection of its own rather than Knex's stream: a stream destroyed midway would have
  // mysql2 read the rest of the result to keep the connection usable, so MariaDB would go on to
  // the end of an abandoned export. Closing the connection stops the statement.
  const connection = (await db.client.acquireConnection()) as StreamingConnection
  const rows = connection
    .query(
      {
        // An export streams for as long as its reader takes to download it, far beyond the API's
        // statement timeout, which would cut it off midway; it gets a limit of its own (both the
        // client's and MariaDB's, see server/db/timeouts.ts).
        sql: `SET STATEMENT max_statement_time = ${EXPORT_STATEMENT_MS / 1000} FOR ${sql}`,
        timeout: EXPORT_STATEMENT_MS,
        // Dates as the text MariaDB sends ('YYYY-MM-DD'): the columns want that text, and a Date
        // object per date and row is work for nothing.
        dateStrings: ['DATE'],
      },
      bindings,
    )
    .stream({ highWaterMark: STREAM_ROWS_AHEAD })
  const readings = new Transform({
    objectMode: true,
    highWaterMark: STREAM_ROWS_AHEAD,
    transform(row: RawRow, _encoding, done) {
      try {
        done(null, toExportReading(row, raterNames))
      } catch (error) {
        done(error as Error)
      }
    },
  })
  let complete = false
  rows.once('end', () => {
    complete = true
  })
  // A failure of the query destroys `readings` with its error, which is how the caller hears of
  // it; either way the connection goes back to the pool, closed unless the result was read to
  // its end (the pool then replaces it).
  return pipeline(rows, readings, () => {
    if (!complete) connection.destroy()
    void db.client.releaseConnection(connection)
  })
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

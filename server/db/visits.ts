import type { Db } from './knex'
import { TABLES } from './tables'
import { toIsoDate, toIsoDateTime } from './rows'
import type { VisitKind } from '../../shared/types/domain'

export interface VisitRecord {
  id: number
  patientId: number
  visitDate: string
  kind: VisitKind
  monthsSinceSurgery: number | null
  indication: string | null
  version: number
  createdAt: string
}

interface VisitRow {
  id: number
  patient_id: number
  visit_date: Date
  kind: VisitKind
  months_since_surgery: number | null
  indication: string | null
  version: number
  created_at: Date
}

const COLUMNS = [
  'id',
  'patient_id',
  'visit_date',
  'kind',
  'months_since_surgery',
  'indication',
  'version',
  'created_at',
]

function toVisit(row: VisitRow): VisitRecord {
  return {
    id: row.id,
    patientId: row.patient_id,
    visitDate: toIsoDate(row.visit_date),
    kind: row.kind,
    monthsSinceSurgery: row.months_since_surgery,
    indication: row.indication,
    version: row.version,
    createdAt: toIsoDateTime(row.created_at),
  }
}

/** A patient's visits in time order (same-day visits in the order they were entered). */
export async function listVisitsOfPatient(db: Db, patientId: number): Promise<VisitRecord[]> {
  const rows = (await db(TABLES.visits)
    .select(COLUMNS)
    .where({ patient_id: patientId })
    .orderBy([
      { column: 'visit_date', order: 'asc' },
      { column: 'id', order: 'asc' },
    ])) as VisitRow[]
  return rows.map(toVisit)
}

export async function findVisit(db: Db, id: number): Promise<VisitRecord | undefined> {
  const row = (await db(TABLES.visits).select(COLUMNS).where({ id }).first()) as
    VisitRow | undefined
  return row ? toVisit(row) : undefined
}

export interface VisitWrite {
  visitDate: string
  kind: VisitKind
  monthsSinceSurgery: number | null
  indication: string | null
}

export async function insertVisit(
  db: Db,
  visit: VisitWrite & { patientId: number; createdBy: number },
): Promise<number> {
  const [id] = await db(TABLES.visits).insert({
    patient_id: visit.patientId,
    visit_date: visit.visitDate,
    kind: visit.kind,
    months_since_surgery: visit.monthsSinceSurgery,
    indication: visit.indication,
    created_by: visit.createdBy,
  })
  return id as number
}

export async function updateVisit(
  db: Db,
  id: number,
  expectedVersion: number,
  patch: Partial<VisitWrite>,
): Promise<boolean> {
  const columns: Record<string, unknown> = {}
  if (patch.visitDate !== undefined) columns.visit_date = patch.visitDate
  if (patch.kind !== undefined) columns.kind = patch.kind
  if (patch.monthsSinceSurgery !== undefined)
    columns.months_since_surgery = patch.monthsSinceSurgery
  if (patch.indication !== undefined) columns.indication = patch.indication
  const changed = await db(TABLES.visits)
    .where({ id, version: expectedVersion })
    .update({ ...columns, version: db.raw('version + 1'), updated_at: new Date() })
  return changed === 1
}

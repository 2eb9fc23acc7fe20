import type { Db } from './knex'
import { TABLES } from './tables'
import { fromResultsColumn, type ResultsWithoutUncertainty } from './reading-results-columns'
import { parseJson, toBoolean, toIsoDate, toIsoDateTime, toNumberOrNull } from './rows'
import type {
  MotionSegment,
  PlannedTreatment,
  ReadingStatus,
  ReadingTemplate,
  VisitKind,
} from '../../shared/types/domain'
import type { ReadingCalibration } from '../../shared/types/readings'
import type { TemplateOptions } from '../../shared/readings/templates'

export interface PlanSegmentRecord {
  id: number
  patientId: number
  segment: MotionSegment
  parsDefectLeft: boolean
  parsDefectRight: boolean
  facetDegeneration: boolean
  dynamicInstability: boolean
  treatment: PlannedTreatment
  implantLordosisDeg: number | null
  implantHeightMm: number | null
  notes: string | null
  version: number
  updatedAt: string
}

type RawRow = Record<string, unknown>

const PLAN_COLUMNS = [
  'id',
  'patient_id',
  'segment',
  'pars_defect_left',
  'pars_defect_right',
  'facet_degeneration',
  'dynamic_instability',
  'treatment',
  'implant_lordosis_deg',
  'implant_height_mm',
  'notes',
  'version',
  'updated_at',
]

function toPlanSegment(row: RawRow): PlanSegmentRecord {
  return {
    id: row.id as number,
    patientId: row.patient_id as number,
    segment: row.segment as MotionSegment,
    parsDefectLeft: toBoolean(row.pars_defect_left as number),
    parsDefectRight: toBoolean(row.pars_defect_right as number),
    facetDegeneration: toBoolean(row.facet_degeneration as number),
    dynamicInstability: toBoolean(row.dynamic_instability as number),
    treatment: row.treatment as PlannedTreatment,
    // DECIMAL columns arrive as strings from mysql2.
    implantLordosisDeg: toNumberOrNull(row.implant_lordosis_deg as string | null),
    implantHeightMm: toNumberOrNull(row.implant_height_mm as string | null),
    notes: row.notes as string | null,
    version: row.version as number,
    updatedAt: toIsoDateTime(row.updated_at as Date),
  }
}

export async function listPlanSegments(db: Db, patientId: number): Promise<PlanSegmentRecord[]> {
  const rows = (await db(TABLES.planSegments)
    .select(PLAN_COLUMNS)
    .where({ patient_id: patientId })) as RawRow[]
  return rows.map(toPlanSegment)
}

export async function findPlanSegment(
  db: Db,
  patientId: number,
  segment: MotionSegment,
): Promise<PlanSegmentRecord | undefined> {
  const row = (await db(TABLES.planSegments)
    .select(PLAN_COLUMNS)
    .where({ patient_id: patientId, segment })
    .first()) as RawRow | undefined
  return row ? toPlanSegment(row) : undefined
}

export interface PlanSegmentFields {
  parsDefectLeft: boolean
  parsDefectRight: boolean
  facetDegeneration: boolean
  dynamicInstability: boolean
  treatment: PlannedTreatment
  implantLordosisDeg: number | null
  implantHeightMm: number | null
  notes: string | null
}

function fieldColumns(fields: PlanSegmentFields) {
  return {
    pars_defect_left: fields.parsDefectLeft,
    pars_defect_right: fields.parsDefectRight,
    facet_degeneration: fields.facetDegeneration,
    dynamic_instability: fields.dynamicInstability,
    treatment: fields.treatment,
    implant_lordosis_deg: fields.implantLordosisDeg,
    implant_height_mm: fields.implantHeightMm,
    notes: fields.notes,
  }
}

/** Inserts a segment's first row; the (patient, segment) unique key turns a race into ER_DUP_ENTRY. */
export async function insertPlanSegment(
  db: Db,
  patientId: number,
  segment: MotionSegment,
  fields: PlanSegmentFields,
  updatedBy: number,
): Promise<void> {
  await db(TABLES.planSegments).insert({
    patient_id: patientId,
    segment,
    ...fieldColumns(fields),
    updated_by: updatedBy,
  })
}

/** Saves only if nobody saved the segment since `expectedVersion`; false otherwise. */
export async function updatePlanSegment(
  db: Db,
  patientId: number,
  segment: MotionSegment,
  expectedVersion: number,
  fields: PlanSegmentFields,
  updatedBy: number,
): Promise<boolean> {
  const changed = await db(TABLES.planSegments)
    .where({ patient_id: patientId, segment, version: expectedVersion })
    .update({
      ...fieldColumns(fields),
      updated_by: updatedBy,
      version: db.raw('version + 1'),
      updated_at: new Date(),
    })
  return changed === 1
}

/** One reading of a patient with the visit it belongs to: what the plan evidence and trends use. */
export interface PatientReadingSummary {
  id: number
  template: ReadingTemplate
  options: TemplateOptions
  status: ReadingStatus
  calibration: ReadingCalibration
  /** Without the intervals: plans and trends use the values alone. */
  results: ResultsWithoutUncertainty
  visitId: number
  visitKind: VisitKind
  visitDate: string
  monthsSinceSurgery: number | null
}

/**
 * Every reading of a patient (drafts included: callers choose), superseded readings excluded
 * (a signed reading stays the record until its amendment is signed), newest first: latest
 * visit, then last submitted (or started), then highest id.
 */
export async function listPatientReadings(
  db: Db,
  patientId: number,
): Promise<PatientReadingSummary[]> {
  const rows = (await db(`${TABLES.readings} as r`)
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .join(`${TABLES.visits} as v`, 'v.id', 'i.visit_id')
    .select(
      'r.id',
      'r.template',
      'r.template_options',
      'r.status',
      'r.calibration',
      'r.results',
      'v.id as visit_id',
      'v.kind as visit_kind',
      'v.visit_date',
      'v.months_since_surgery',
    )
    .where('v.patient_id', patientId)
    .whereNot('r.status', 'superseded')
    // Blinded re-readings belong to reliability rounds, not to the patient's care.
    .where('r.blinded', false)
    .orderBy([
      { column: 'v.visit_date', order: 'desc' },
      { column: 'r.submitted_at', order: 'desc' },
      { column: 'r.created_at', order: 'desc' },
      { column: 'r.id', order: 'desc' },
    ])) as RawRow[]
  return rows.map((row) => ({
    id: row.id as number,
    template: row.template as ReadingTemplate,
    options: parseJson<TemplateOptions>(row.template_options) ?? {},
    status: row.status as ReadingStatus,
    calibration: parseJson<ReadingCalibration>(row.calibration) ?? {
      mmPerPixel: null,
      source: 'none',
    },
    results: fromResultsColumn(row.results),
    visitId: row.visit_id as number,
    visitKind: row.visit_kind as VisitKind,
    visitDate: toIsoDate(row.visit_date as Date),
    monthsSinceSurgery: row.months_since_surgery as number | null,
  }))
}

import type { ReadingCalibration, ReadingResults } from '../../shared/types/readings'
import type { ReadingTemplate, Sex, VisitKind } from '../../shared/types/domain'
import type {
  MotionSegmentResult,
  SegmentMeasurement,
  SegmentName,
  SubsidenceSegmentResult,
} from '../../shared/types/measurement'
import { SOURCES } from '../../shared/measurement/sources'
import { deidentifiedAgeInYears } from '../db/rows'
import { sourceWords } from '../../shared/readings/source-words'

/** One reading as the export query reads it (identified fields included; columns choose). */
export interface ExportReading {
  readingId: number
  imageId: number
  template: ReadingTemplate
  status: string
  engineVersion: string
  calibration: ReadingCalibration
  /** The parts of the stored results the columns read (the intervals, stored apart, are not fetched). */
  results: Pick<ReadingResults, 'measurements' | 'motion' | 'subsidence'>
  raterId: number
  raterName: string
  visitKind: VisitKind
  visitDate: string
  studyCode: string
  sex: Sex
  birthDate: string
  recordNumber: string
  familyName: string
  givenName: string
  /** The patient's first post-op visit, taken as the day of surgery; null without one. */
  firstPostOpDate: string | null
}

/** One output row: a reading and one of its segments (null for a reading without segments). */
export interface ExportRowContext {
  reading: ExportReading
  segment: SegmentName | null
}

export type ColumnKind = 'text' | 'number' | 'integer'
export type Cell = string | number | null

export interface ExportColumn {
  /** Header in the file: the name, then the unit in parentheses when there is one. */
  header: string
  unit: string | null
  kind: ColumnKind
  definition: string
  /** The published source or "derived"/"record" in plain words. */
  source: string
  /** Names, record numbers and dates: only in a clinician's identified export. */
  identified?: true
  /**
   * The value differs between the rows of one reading (it reads the row's segment); the others
   * are the reading's and are computed once per reading.
   */
  perSegment?: true
  value(context: ExportRowContext): Cell
}

const DAY_MS = 86_400_000

function daysBetween(fromIsoDate: string, toIsoDate: string): number {
  return Math.round(
    (Date.parse(`${toIsoDate}T00:00:00Z`) - Date.parse(`${fromIsoDate}T00:00:00Z`)) / DAY_MS,
  )
}

const segmentOf = (context: ExportRowContext): SegmentMeasurement | undefined =>
  context.segment ? context.reading.results.measurements.segments[context.segment] : undefined

const motionOf = (context: ExportRowContext): MotionSegmentResult | undefined =>
  context.segment ? context.reading.results.motion?.segments[context.segment] : undefined

const subsidenceOf = (context: ExportRowContext): SubsidenceSegmentResult | undefined =>
  context.segment
    ? context.reading.results.subsidence?.[context.segment]?.segments[context.segment]
    : undefined

const flag = (value: boolean | null | undefined): Cell =>
  value === null || value === undefined ? null : value ? 1 : 0

const column = (
  name: string,
  unit: string | null,
  kind: ColumnKind,
  definition: string,
  source: string,
  value: (context: ExportRowContext) => Cell | undefined,
  identified?: true,
): ExportColumn => ({
  header: unit ? `${name} (${unit})` : name,
  unit,
  kind,
  definition,
  source: sourceWords(source),
  ...(identified ? { identified } : {}),
  value: (context) => value(context) ?? null,
})

/** A column whose value reads the row's segment. */
const segmentColumn = (...args: Parameters<typeof column>): ExportColumn => ({
  ...column(...args),
  perSegment: true,
})

const RECORD = 'patient record'
const DERIVED = 'derived from the record'

/** Identifying columns a surgeon may ask for; never in a researcher's export. */
export const IDENTIFIED_COLUMNS: ExportColumn[] = [
  column(
    'record_number',
    null,
    'text',
    'Hospital record number',
    RECORD,
    (c) => c.reading.recordNumber,
    true,
  ),
  column('family_name', null, 'text', 'Family name', RECORD, (c) => c.reading.familyName, true),
  column('given_name', null, 'text', 'Given name', RECORD, (c) => c.reading.givenName, true),
  column(
    'birth_date',
    null,
    'text',
    'Date of birth (YYYY-MM-DD)',
    RECORD,
    (c) => c.reading.birthDate,
    true,
  ),
  column(
    'visit_date',
    null,
    'text',
    'Date of the visit (YYYY-MM-DD)',
    RECORD,
    (c) => c.reading.visitDate,
    true,
  ),
  column(
    'rater_name',
    null,
    'text',
    'Name of the person who placed the landmarks',
    RECORD,
    (c) => c.reading.raterName,
    true,
  ),
]

/** The de-identified columns every export has, in order. */
export const MEASUREMENT_COLUMNS: ExportColumn[] = [
  column(
    'study_code',
    null,
    'text',
    "The patient's pseudonym, the same in every export",
    RECORD,
    (c) => c.reading.studyCode,
  ),
  column(
    'sex',
    null,
    'text',
    'Sex as recorded: female, male, other or unknown',
    RECORD,
    (c) => c.reading.sex,
  ),
  column(
    'age_at_visit',
    'years',
    'integer',
    'Full years from birth to the visit; 90 stands for 90 or older',
    'derived; ages above 89 grouped as in the HIPAA Safe Harbor method (from memory, verify)',
    (c) => deidentifiedAgeInYears(c.reading.birthDate, c.reading.visitDate),
  ),
  column(
    'visit_kind',
    null,
    'text',
    'pre-op, post-op or follow-up',
    RECORD,
    (c) => c.reading.visitKind,
  ),
  column(
    'days_since_surgery',
    'days',
    'integer',
    "Days from the patient's first post-op visit (taken as the day of surgery) to this visit; negative before it; empty when no post-op visit is recorded",
    DERIVED,
    (c) =>
      c.reading.firstPostOpDate === null
        ? null
        : daysBetween(c.reading.firstPostOpDate, c.reading.visitDate),
  ),
  column(
    'reading_id',
    null,
    'integer',
    'Identifier of the reading in Endplate',
    RECORD,
    (c) => c.reading.readingId,
  ),
  column(
    'film_id',
    null,
    'integer',
    'Identifier of the film (its de-identified DICOM is at /api/images/{film_id}/dicom)',
    RECORD,
    (c) => c.reading.imageId,
  ),
  column(
    'template',
    null,
    'text',
    'Reading template: slip-grade, lumbar-alignment, construct-check or motion-pair',
    RECORD,
    (c) => c.reading.template,
  ),
  column(
    'status',
    null,
    'text',
    'Status of the reading when exported (draft, submitted, signed, ...)',
    RECORD,
    (c) => c.reading.status,
  ),
  column(
    'rater',
    null,
    'text',
    'Code of the rater (R and a number, the same for one person in every export)',
    RECORD,
    (c) => `R${c.reading.raterId}`,
  ),
  column(
    'engine_version',
    null,
    'text',
    'Version of the measurement engine that computed the values',
    RECORD,
    (c) => c.reading.engineVersion,
  ),
  column(
    'calibration_source',
    null,
    'text',
    'Where the mm scale came from: dicom-pixel-spacing, dicom-imager-spacing(-magnification), manual or none (mm values are then empty)',
    RECORD,
    (c) => c.reading.calibration.source,
  ),
  column(
    'mm_per_pixel_row',
    'mm/px',
    'number',
    'Spacing between pixel rows used for every mm value',
    RECORD,
    (c) => c.reading.calibration.mmPerPixel?.[0],
  ),
  column(
    'mm_per_pixel_column',
    'mm/px',
    'number',
    'Spacing between pixel columns used for every mm value',
    RECORD,
    (c) => c.reading.calibration.mmPerPixel?.[1],
  ),
  segmentColumn(
    'segment',
    null,
    'text',
    'Motion segment of the row (L1-L2 … L5-S1); the reading-wide values repeat on each of its rows',
    RECORD,
    (c) => c.segment,
  ),
  segmentColumn(
    'slip',
    '%',
    'number',
    'Slip of the upper vertebra over the lower endplate depth, 100·d/depth; positive anterolisthesis, negative retrolisthesis',
    SOURCES.slip,
    (c) => segmentOf(c)?.slipPercent,
  ),
  segmentColumn(
    'slip',
    'mm',
    'number',
    'Slip distance d; empty when uncalibrated',
    SOURCES.slip,
    (c) => segmentOf(c)?.slipMm,
  ),
  segmentColumn(
    'meyerding_grade',
    null,
    'text',
    'Meyerding grade I–V from the slip rounded to 0.1 %; empty for no anterior slip',
    SOURCES.meyerding,
    (c) => segmentOf(c)?.meyerdingGrade,
  ),
  segmentColumn(
    'slip_direction',
    null,
    'text',
    'anterolisthesis, retrolisthesis or none, after the same rounding',
    SOURCES.slip,
    (c) => segmentOf(c)?.slipDirection,
  ),
  segmentColumn(
    'high_grade_slip',
    null,
    'integer',
    'Slip over 50 %: 1 yes, 0 no',
    SOURCES.highGrade,
    (c) => flag(segmentOf(c)?.highGrade),
  ),
  segmentColumn(
    'segmental_lordosis',
    'deg',
    'number',
    "Cobb angle from the upper vertebra's superior to the lower vertebra's inferior endplate (S1: superior); lordosis positive",
    SOURCES.segmentalLordosis,
    (c) => segmentOf(c)?.segmentalLordosisDeg,
  ),
  segmentColumn(
    'disc_angle',
    'deg',
    'number',
    'Angle between the endplates bounding the disc; lordosis positive',
    SOURCES.segmentalLordosis,
    (c) => segmentOf(c)?.discAngleDeg,
  ),
  segmentColumn(
    'disc_height_anterior',
    'mm',
    'number',
    'Anterior disc height, corner to corner; empty when uncalibrated',
    SOURCES.discHeight,
    (c) => segmentOf(c)?.discHeightMm?.anterior,
  ),
  segmentColumn(
    'disc_height_middle',
    'mm',
    'number',
    'Middle disc height; empty when uncalibrated',
    SOURCES.discHeight,
    (c) => segmentOf(c)?.discHeightMm?.middle,
  ),
  segmentColumn(
    'disc_height_posterior',
    'mm',
    'number',
    'Posterior disc height, corner to corner; empty when uncalibrated',
    SOURCES.discHeight,
    (c) => segmentOf(c)?.discHeightMm?.posterior,
  ),
  segmentColumn(
    'disc_height_mean',
    'mm',
    'number',
    'Mean of anterior and posterior disc height (two-point mean)',
    SOURCES.discHeight,
    (c) => segmentOf(c)?.discHeightMm?.mean,
  ),
  segmentColumn(
    'slip_angle',
    'deg',
    'number',
    'Boxall slip angle at L5-S1, kyphosis positive',
    SOURCES.slipAngle,
    (c) => segmentOf(c)?.slipAngleDeg,
  ),
  segmentColumn(
    'cage_lordosis',
    'deg',
    'number',
    'Angle between the surfaces of an interbody cage, lordosis positive',
    SOURCES.cageLordosis,
    (c) => segmentOf(c)?.cageLordosisDeg,
  ),
  segmentColumn(
    'implant_position',
    '%',
    'number',
    "Implant marker along the lower vertebra's superior endplate, percent of its depth from the posterior edge",
    SOURCES.implantPosition,
    (c) => segmentOf(c)?.implantPositionPercent,
  ),
  segmentColumn(
    'implant_offset',
    'mm',
    'number',
    'Implant marker offset from the endplate midpoint, negative posterior',
    SOURCES.implantPosition,
    (c) => segmentOf(c)?.implantOffsetMm,
  ),
  segmentColumn(
    'range_of_motion',
    'deg',
    'number',
    'Angular range of motion of the segment between flexion and extension films',
    'difference of the segmental angles on the two films [D]',
    (c) => motionOf(c)?.rangeOfMotionDeg,
  ),
  segmentColumn(
    'translation',
    'mm',
    'number',
    'Sagittal translation between flexion and extension films',
    SOURCES.ideTranslation,
    (c) => motionOf(c)?.translationMm,
  ),
  segmentColumn(
    'translation',
    '%',
    'number',
    'Translation as the difference of slip % on the two films',
    SOURCES.whitePanjabi,
    (c) => motionOf(c)?.translationPercent,
  ),
  segmentColumn(
    'subsidence_mean_loss',
    'mm',
    'number',
    'Loss of mean disc height against the first post-op reading of the segment, positive = lower now',
    SOURCES.subsidence,
    (c) => subsidenceOf(c)?.lossMm.mean,
  ),
  column(
    'lumbar_lordosis_L1_S1',
    'deg',
    'number',
    'L1 superior to S1 superior endplate, lordosis positive',
    SOURCES.lumbarLordosis,
    (c) => c.reading.results.measurements.lumbarLordosisDeg,
  ),
  column(
    'lordosis_L4_S1',
    'deg',
    'number',
    'L4 superior to S1 superior endplate, lordosis positive',
    SOURCES.distalLordosis,
    (c) => c.reading.results.measurements.distalLordosisDeg,
  ),
  column(
    'pelvic_incidence',
    'deg',
    'number',
    'Pelvic incidence',
    SOURCES.pelvis,
    (c) => c.reading.results.measurements.pelvis?.incidenceDeg,
  ),
  column(
    'pelvic_tilt',
    'deg',
    'number',
    'Pelvic tilt',
    SOURCES.pelvis,
    (c) => c.reading.results.measurements.pelvis?.tiltDeg,
  ),
  column(
    'sacral_slope',
    'deg',
    'number',
    'Sacral slope',
    SOURCES.pelvis,
    (c) => c.reading.results.measurements.pelvis?.sacralSlopeDeg,
  ),
  column(
    'pi_ll_mismatch',
    'deg',
    'number',
    'Pelvic incidence minus L1–S1 lordosis',
    SOURCES.piLlBand,
    (c) => c.reading.results.measurements.piLlMismatchDeg,
  ),
  column(
    'pi_ll_modifier',
    null,
    'text',
    "SRS-Schwab PI−LL modifier: 0 (< 10°), + (10–20°), ++ (> 20°); written '+ and '++ so that spreadsheets read them as text, not formulas",
    SOURCES.piLlBand,
    (c) => c.reading.results.measurements.piLlBand,
  ),
  column(
    'target_lordosis',
    'deg',
    'number',
    'Target lordosis 0.54·PI + 27.6',
    SOURCES.targetLordosis,
    (c) => c.reading.results.measurements.targetLordosisDeg,
  ),
]

/** The columns of one export: identifying ones first when a clinician asked for them. */
export function exportColumns(identified: boolean): ExportColumn[] {
  return identified ? [...IDENTIFIED_COLUMNS, ...MEASUREMENT_COLUMNS] : MEASUREMENT_COLUMNS
}

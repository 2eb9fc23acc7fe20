import type {
  MotionSegment,
  PlannedTreatment,
  ReadingStatus,
  ReadingTemplate,
  SpacingSource,
  VisitKind,
} from './domain'
import type {
  FrontalImageRightSide,
  MeyerdingGrade,
  PiLlBand,
  PlanCheckFlag,
  PlannedLordosisEstimate,
} from './measurement'

/** The reading a measured value was taken from, so every number on the plan can be traced. */
export interface MeasureSource {
  readingId: number
  template: ReadingTemplate
  status: ReadingStatus
  visitId: number
  visitKind: VisitKind
  /** Millimetre values only: where the film's scale came from. */
  calibrationSource: SpacingSource | null
}

/** A measured value with its reading; the field itself is null when nothing measured it. */
export interface MeasuredValue<T = number> extends MeasureSource {
  value: T
}

/** What the latest submitted or signed pre-op readings say about one segment. */
export interface SegmentEvidence {
  /** Taillard slip in % (positive anterolisthesis). */
  slipPercent: MeasuredValue | null
  meyerdingGrade: MeasuredValue<MeyerdingGrade | null> | null
  /** Flexion–extension translation in mm (motion pair). */
  dynamicTranslationMm: MeasuredValue | null
  /** Two-point mean disc height in mm. */
  residualDiscHeightMm: MeasuredValue | null
  /** Cobb angle of the segment in degrees, lordosis positive. */
  currentSegmentalLordosisDeg: MeasuredValue | null
}

/** A disc replacement's position on the frontal film: its lateral offset and tilt. */
export interface FrontalImplantPosition {
  /** Offset of the implant centre from the body midline, mm, positive toward image right. */
  lateralOffsetMm: number | null
  /** The same as % of the endplate width. */
  lateralOffsetPercent: number | null
  /** Implant coronal tilt against the endplates, degrees. */
  implantTiltDeg: number | null
  /** Above the centring threshold; null without calibration. */
  offCentre: boolean | null
  thresholdMm: number
  /** Which patient side the film's right edge shows (DICOM Patient Orientation). */
  imageRightSide: FrontalImageRightSide
}

/**
 * Where a disc replacement sits after surgery, from the latest submitted or signed post-op or
 * follow-up readings: along the endplate on the lateral film (construct check) and against
 * the body midline on the frontal film (implant centring).
 */
export interface ImplantPositionEvidence {
  /** Marker position along W's superior endplate, % of its depth from the posterior edge. */
  lateralPositionPercent: MeasuredValue | null
  /** Marker offset from the endplate middle, mm, negative posterior. */
  lateralOffsetMm: MeasuredValue | null
  frontal: MeasuredValue<FrontalImplantPosition> | null
  /** What the lateral and frontal values rest on, in plain words. */
  lateralSource: string
  frontalSource: string
}

export interface PlanSegment {
  segment: MotionSegment
  /** Findings are null while the segment was never saved: not recorded, which is not "absent". */
  parsDefectLeft: boolean | null
  parsDefectRight: boolean | null
  facetDegeneration: boolean | null
  dynamicInstability: boolean | null
  treatment: PlannedTreatment
  /** Lordotic angle of the planned implant in degrees. */
  implantLordosisDeg: number | null
  /** Height of the planned implant in mm. */
  implantHeightMm: number | null
  notes: string | null
  /** Null = never saved; send it back unchanged to create the row. */
  version: number | null
  updatedAt: string | null
  evidence: SegmentEvidence
  /** Disc-replacement checks; empty for other treatments. */
  checks: PlanCheckFlag[]
  /** Disc replacement only: the implant's position after surgery; null for other treatments. */
  implantPosition: ImplantPositionEvidence | null
  /**
   * Disc replacement only: instability recorded as a finding (the measured check is translation
   * over 5 mm). Null for other treatments.
   */
  recordedInstability: RecordedFindingFlag | null
}

/** A flag raised by a recorded finding rather than a measured value. */
export interface RecordedFindingFlag {
  label: string
  /** Null when the segment was never saved (not recorded). */
  flagged: boolean | null
  source: string
}

/** The plan's expected L1–S1 lordosis beside the target from PI, with what they rest on. */
export interface PlanLordosis extends PlannedLordosisEstimate {
  currentLordosisDeg: MeasuredValue | null
  pelvicIncidenceDeg: MeasuredValue | null
  /** PI − current L1–S1 lordosis, and its SRS-Schwab band. */
  currentMismatchDeg: number | null
  currentBand: PiLlBand | null
  /** PI − expected lordosis after the plan, and its band. */
  plannedMismatchDeg: number | null
  plannedBand: PiLlBand | null
}

export interface PatientPlan {
  patientId: number
  segments: PlanSegment[]
  lordosis: PlanLordosis
  /** Says which readings the evidence was drawn from. */
  evidenceNote: string
}

/** Treatments that place an implant or set the segment angle: only these carry implant values. */
export const IMPLANT_TREATMENTS: readonly PlannedTreatment[] = [
  'disc-replacement',
  'interbody-fusion',
  'posterior-fusion',
]

export interface PlanSegmentInput {
  parsDefectLeft: boolean
  parsDefectRight: boolean
  facetDegeneration: boolean
  dynamicInstability: boolean
  treatment: PlannedTreatment
  implantLordosisDeg: number | null
  implantHeightMm: number | null
  notes: string | null
  /** The version last read; null to create a segment that was never saved. */
  version: number | null
}

export type TrendMeasure = 'slip-percent' | 'lumbar-lordosis' | 'segmental-lordosis' | 'disc-height'

/** A visit on the trend axis; researchers get a sequence number instead of the date. */
export interface TrendVisit {
  visitId: number
  visitKind: VisitKind
  monthsSinceSurgery: number | null
  /** Null for researchers. */
  visitDate: string | null
  /** 1-based position in time order. */
  sequence: number
}

export interface TrendPoint extends MeasureSource {
  value: number
  /** True when no submitted or signed reading of the visit measured it and a draft stands in. */
  isDraft: boolean
}

export interface TrendSeries {
  /** Stable key, e.g. 'slip-percent:L5-S1'. */
  key: string
  measure: TrendMeasure
  segment: MotionSegment | null
  label: string
  unit: '%' | '°' | 'mm'
  /** At most one point per visit, in visit order. */
  points: TrendPoint[]
}

export interface PatientTrends {
  patientId: number
  visits: TrendVisit[]
  series: TrendSeries[]
}

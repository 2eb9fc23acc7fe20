import type { LandmarkDocument, PixelPoint } from './landmarks'
import type {
  ImplantCentringResult,
  MeasurementResult,
  MotionPairResult,
  SubsidenceResult,
  UncertaintyResult,
} from './measurement'
import type { ReadingStatus, ReadingTemplate, SpacingSource, VisitKind } from './domain'
import type { TemplateOptions } from '../readings/templates'

/** The spacing a reading was computed with, and where it came from (shown beside every mm). */
export interface ReadingCalibration {
  mmPerPixel: [row: number, column: number] | null
  source: SpacingSource
}

/** Everything the server computed from the landmarks with the shared engine. */
export interface ReadingResults {
  measurements: MeasurementResult
  uncertainty: UncertaintyResult | null
  /** Motion pair only: flexion (image) against extension (paired image). */
  motion: MotionPairResult | null
  /**
   * Construct check only: per treated segment, the loss against the earliest post-op reading of
   * an earlier visit that measured that segment.
   */
  subsidence: Record<string, SubsidenceResult & { baselineReadingId: number }> | null
  /** The earliest baseline reading used, when there is one. */
  subsidenceBaselineReadingId: number | null
  /**
   * Implant centring only: the off-centre check of each frontal segment at the site threshold,
   * and which patient side the film's right edge shows. Absent on results stored before it.
   */
  centring?: ImplantCentringResult | null
  /**
   * The site settings the server computed with (absent on results stored before they were
   * recorded): a signed reading keeps the values it was signed with.
   */
  computedWith?: ResultSettings
}

/** Site settings that enter a reading's results. */
export interface ResultSettings {
  landmarkSigmaMm: number
  subsidenceThresholdMm: number
  instabilityCriterion: import('./measurement').InstabilityCriterionId
  /** Implant centring: flag a disc replacement further than this off the midline (mm). */
  implantCentringThresholdMm: number
}

export interface Reading {
  id: number
  imageId: number
  pairedImageId: number | null
  raterId: number
  raterName: string
  template: ReadingTemplate
  options: TemplateOptions
  /** Landmarks placed on the image (flexion film for a motion pair). */
  landmarks: LandmarkDocument
  /** Motion pair only: landmarks on the extension film. */
  pairedLandmarks: LandmarkDocument | null
  calibration: ReadingCalibration
  pairedCalibration: ReadingCalibration | null
  results: ReadingResults
  engineVersion: string
  status: ReadingStatus
  version: number
  blinded: boolean
  /** The signed reading this one amends, and why (free text: null for researchers). */
  supersedesId: number | null
  supersedeReason: string | null
  /** The amendment that replaced this reading once signed, or the one under way. */
  supersededById: number | null
  /** The surgeon the submission went to (the patient's responsible surgeon), if any. */
  reviewerId: number | null
  submittedAt: string | null
  signedAt: string | null
  signedBy: number | null
  signedByName: string | null
  /** The latest return: who sent it back and why (the comment is null for researchers). */
  returnedBy: number | null
  returnedByName: string | null
  returnedAt: string | null
  returnComment: string | null
  /** Timestamps are null for researchers: they would date the visit. */
  createdAt: string | null
  updatedAt: string | null
}

export interface ReturnReadingInput {
  version: number
  comment: string
}

export interface AmendmentInput {
  reason: string
}

export interface CommentInput {
  text: string
}

/** One entry of a reading's thread: a remark, or the comment a surgeon returned it with. */
export interface ReadingComment {
  id: number
  readingId: number
  authorId: number
  authorName: string
  kind: 'comment' | 'return'
  text: string
  createdAt: string
}

export const READING_SORT_FIELDS = [
  'submittedAt',
  'signedAt',
  'updatedAt',
  'createdAt',
  'id',
] as const
export type ReadingSortField = (typeof READING_SORT_FIELDS)[number]

/** GET /api/readings: worklists and a patient's readings. */
export interface ReadingQuery {
  status?: ReadingStatus[]
  /** `me`: readings the signed-in user made. */
  rater?: 'me'
  /** `me`: submitted readings waiting for the signed-in surgeon (sent to them, or to no one). */
  awaiting?: 'me'
  signedBy?: 'me'
  returnedBy?: 'me'
  patientId?: number
  sort?: ReadingSortField
  order?: 'asc' | 'desc'
  offset?: number
  limit?: number
}

/** A worklist row. Patient names, record numbers, dates and free text are null for researchers. */
export interface ReadingSummary {
  id: number
  imageId: number
  template: ReadingTemplate
  options: TemplateOptions
  status: ReadingStatus
  version: number
  raterId: number
  raterName: string
  patientId: number
  studyCode: string
  patientName: string | null
  recordNumber: string | null
  visitId: number
  visitKind: VisitKind
  visitDate: string | null
  reviewerId: number | null
  submittedAt: string | null
  signedAt: string | null
  signedByName: string | null
  returnedAt: string | null
  returnedByName: string | null
  returnComment: string | null
  supersedesId: number | null
  supersededById: number | null
  createdAt: string | null
  updatedAt: string | null
}

export interface CreateReadingInput {
  template: ReadingTemplate
  options?: TemplateOptions
  pairedImageId?: number
  points?: Record<string, PixelPoint>
}

export interface PatchReadingInput {
  points: Record<string, PixelPoint>
  pairedPoints?: Record<string, PixelPoint>
  /** The version the edit was based on; a stale one answers 409 with the current reading. */
  version: number
}

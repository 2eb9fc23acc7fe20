import type { LandmarkDocument, PixelPoint } from './landmarks'
import type {
  ImplantCentringResult,
  MeasurementResult,
  MotionPairResult,
  SubsidenceResult,
  UncertaintyResult,
} from './measurement'
import type { ReadingStatus, ReadingTemplate, SpacingSource } from './domain'
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
  supersedesId: number | null
  supersedeReason: string | null
  submittedAt: string | null
  signedAt: string | null
  signedBy: number | null
  /** Timestamps are null for researchers: they would date the visit. */
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

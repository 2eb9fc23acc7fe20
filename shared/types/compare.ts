import type { ImageRecord, Visit } from './api'
import type { ImageView, SpacingSource, VisitKind } from './domain'
import type { PixelPoint } from './landmarks'
import type { DiscHeights, MeasurementResult, SegmentName, UncertaintyResult } from './measurement'
import type { Reading } from './readings'

/** Which film of a reading a film is: the reading's image, or its paired (extension) image. */
export type ReadingFilmSide = 'primary' | 'paired'

/** A value with the half-width of its 95 % interval (null when no interval could be formed). */
export interface ValueWithInterval {
  value: number
  halfWidth95: number | null
}

/** What a film's reading measured on that film, with the calibration of the mm values. */
export interface FilmMeasures {
  measurements: MeasurementResult
  uncertainty: UncertaintyResult | null
  calibrationSource: SpacingSource
}

/** The usual pairings of two films of one patient. */
export type ComparisonKind = 'pre-op-post-op' | 'follow-ups' | 'flexion-extension' | 'other'

/** One measure on both films: each value, and after − before with the combined interval. */
export interface DifferenceRow {
  id: string
  segment: SegmentName | null
  label: string
  unit: '%' | '°' | 'mm'
  before: ValueWithInterval | null
  after: ValueWithInterval | null
  /** after − before; null when either value is missing. */
  change: ValueWithInterval | null
  /** mm rows only: where each film's scale came from. */
  calibration: { before: SpacingSource; after: SpacingSource } | null
  source: string
}

/** A planned target beside what the later film achieved. */
export interface PlanAchievedRow {
  id: string
  segment: SegmentName | null
  label: string
  /** Degrees. */
  planned: number | null
  plannedLabel: string
  achieved: ValueWithInterval | null
  achievedLabel: string
  /** achieved − planned, degrees. */
  differenceDeg: number | null
  source: string
}

/** Motion of one segment, from the motion-pair reading that measured it. */
export interface MotionRow {
  readingId: number
  segment: SegmentName
  rangeOfMotionDeg: number | null
  translationMm: number | null
  translationPercent: number | null
  calibrationSource: SpacingSource
  /** The instability criteria the segment meets, by their sources. */
  flaggedBy: string[]
}

/** Subsidence of one segment, from the construct-check reading that measured it. */
export interface SubsidenceRow {
  readingId: number
  baselineReadingId: number
  segment: SegmentName
  /** Loss of height against the baseline, mm (positive = lower now). */
  lossMm: DiscHeights
  thresholdMm: number
  subsided: boolean | null
  source: string
}

/** Everything the differences table shows. */
export interface ComparisonTable {
  kind: ComparisonKind
  /** Segments measured on both films, cranial to caudal: the rows' segments. */
  segments: SegmentName[]
  /** Segments with implant centring measured on both (frontal) films, cranial to caudal. */
  frontalSegments: SegmentName[]
  rows: DifferenceRow[]
  plan: PlanAchievedRow[]
  motion: MotionRow[]
  subsidence: SubsidenceRow[]
  /** How the interval of a change was combined from the two readings' intervals. */
  intervalMethod: string
  /** Cautions about this pair (calibration that differs between the films, say). */
  notes: string[]
}

/** One side of a comparison: the film, its visit and its current reading. */
export interface ComparisonFilm {
  image: ImageRecord
  visit: Visit
  /** The film's current reading, or the one asked for; null when the film has none. */
  reading: Reading | null
  side: ReadingFilmSide | null
  /** Landmarks on this film from its reading (image px). */
  points: Record<string, PixelPoint>
  measures: FilmMeasures | null
}

export interface Comparison {
  patientId: number
  /** The earlier film (the flexion film of a flexion/extension pair). */
  before: ComparisonFilm
  after: ComparisonFilm
  table: ComparisonTable
}

/** A film as the pair suggestions need it. */
export interface CompareCandidateFilm {
  imageId: number
  view: ImageView
}

/** A patient's visit with its films, in time order, for the pair suggestions. */
export interface CompareCandidateVisit {
  visitId: number
  visitKind: VisitKind
  films: CompareCandidateFilm[]
}

export interface SuggestedPair {
  kind: ComparisonKind
  label: string
  beforeImageId: number
  afterImageId: number
}

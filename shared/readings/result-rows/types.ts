import type { SpacingSource } from '../../types/domain'
import type {
  IntervalTree,
  MeasurementResult,
  SegmentMeasurement,
  UncertaintyResult,
} from '../../types/measurement'

export interface ResultRow {
  id: string
  label: string
  /** The value with its unit, or '—' when it cannot be computed. */
  value: string
  /** '± 3.7 %' (95 % interval half-width), or null. */
  interval: string | null
  /** For mm values: the calibration source. */
  calibration: string | null
  source: string
  emphasis?: boolean
}

export interface ResultFlag {
  id: string
  tone: 'warn' | 'info'
  text: string
  /** Where the rule comes from; a plain hint has none. */
  source?: string
}

export interface ResultSection {
  id: string
  title: string
  rows: ResultRow[]
  flags: ResultFlag[]
  /** The grading rule, when the section grades a slip. */
  rule?: string
}

export interface FilmResults {
  measurements: MeasurementResult | null
  uncertainty: UncertaintyResult | null
  spacingSource: SpacingSource
}

/** One segment's 95 % intervals, when the uncertainty could be computed. */
export type SegmentIntervals = IntervalTree<SegmentMeasurement> | undefined

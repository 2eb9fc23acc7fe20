/** Re-reading rounds: blinded readings of a study's films, for inter- and intra-rater reliability. */
import type { MotionSegment, ReadingTemplate } from './domain'
import type { IccForm } from '../statistics/icc'

export const ROUND_KINDS = ['inter', 'intra'] as const
export type RoundKind = (typeof ROUND_KINDS)[number]

export const ROUND_STATUSES = ['open', 'closed'] as const
export type RoundStatus = (typeof ROUND_STATUSES)[number]

/** Templates a round may use: one lateral film, no pairing, nothing read from the patient's other films. */
export const ROUND_TEMPLATES = [
  'lumbar-alignment',
  'slip-grade',
] as const satisfies readonly ReadingTemplate[]
export type RoundTemplate = (typeof ROUND_TEMPLATES)[number]

export interface RoundOptions {
  /** Whether the rater sees the computed results before submitting (false: only afterwards). */
  showResultsBeforeSubmit: boolean
  /** Intra rounds: days between a rater's last reading of one pass and the opening of the next. */
  gapDays?: number
}

export interface RoundTemplateOptions {
  /** Slip grade: the segment read (L5-S1 unless given). */
  segment?: MotionSegment
}

export interface CreateRoundInput {
  name: string
  kind: RoundKind
  template: RoundTemplate
  templateOptions?: RoundTemplateOptions
  options: RoundOptions
  imageIds: number[]
  raterIds: number[]
  /** Passes per rater: 1 for an inter round; 2 (default) or more for an intra round. */
  repeats?: number
  /** Seed of the orders and blind codes; a random one is drawn and stored when absent. */
  seed?: string
}

export interface RoundSummary {
  id: number
  studyId: number
  name: string
  kind: RoundKind
  template: RoundTemplate
  templateOptions: RoundTemplateOptions
  options: RoundOptions
  status: RoundStatus
  imageCount: number
  raterCount: number
  repeats: number
  assignmentsDone: number
  assignmentsTotal: number
  /** The seed the orders were drawn from (for managers and researchers; never sent to raters). */
  seed: string
  createdAt: string
  version: number
}

export interface RoundRaterProgress {
  raterCode: string
  /** Clinical roles only (surgeons and administrators); researchers see the code alone. */
  userId?: number
  displayName?: string
  done: number
  due: number
  /** Repeats not yet open because of the gap (or because the previous pass is unfinished). */
  waiting: number
}

export interface RoundDetail extends RoundSummary {
  raters: RoundRaterProgress[]
  images: Array<{ blindCode: string }>
}

export interface RoundPatch {
  version: number
  status: RoundStatus
}

export type AssignmentStatus = 'due' | 'waiting' | 'done'

/** One film to read, as its rater sees it: nothing about the patient, the visit or a date. */
export interface Assignment {
  id: number
  roundId: number
  roundName: string
  template: RoundTemplate
  templateOptions: RoundTemplateOptions
  blindCode: string
  repetition: number
  position: number
  status: AssignmentStatus
  /** ISO time the assignment opens, while it waits for the intra-rater gap; else null. */
  availableFrom: string | null
  readingId: number | null
  showResultsBeforeSubmit: boolean
}

/** What the blinded workspace needs to draw a film: its size, scale and display window. */
export interface AssignmentFilm {
  width: number
  height: number
  spacingMm: { row: number; column: number } | null
  calibrationSource: string
  bitsStored: number
  window: { center: number; width: number } | null
  urls: { display: string; preview: string; thumbnail: string; fullDepth: string }
}

/** One ICC form; a bound or F that is infinite (perfect agreement, very few targets) is null. */
export interface IccFormResult {
  icc: number
  lower: number | null
  upper: number | null
  f: number | null
  df1: number
  df2: number
  p: number
}

export interface KappaEstimate {
  kappa: number
  lower: number
  upper: number
}

export interface AgreementPair {
  a: string
  b: string
  n: number
  bias: number
  sd: number
  lower: number
  upper: number
  biasCi: [number, number]
  lowerCi: [number, number]
  upperCi: [number, number]
  points: Array<{ mean: number; difference: number }>
}

export interface KappaPair {
  a: string
  b: string
  n: number
  linear: KappaEstimate | null
  quadratic: KappaEstimate | null
  /** Why a weighting has no number (e.g. every film was given the same grade). */
  tooFew: string | null
}

export interface MeasureResult {
  key: string
  label: string
  unit: string
  n: number
  k: number
  excluded: number
  tooFew: string | null
  forms: Record<IccForm, IccFormResult> | null
  /** Koo & Li (2016) band of the lower 95 % bound of ICC(2,1). */
  band: 'poor' | 'moderate' | 'good' | 'excellent' | null
  sem: number | null
  mdc95: number | null
  pairs: AgreementPair[]
  /** Meyerding grade only: weighted kappa for each pair of raters. */
  kappa?: KappaPair[]
}

export interface RoundResults {
  roundId: number
  kind: RoundKind
  computedAt: string
  /** The columns of the statistics: rater codes, or for an intra round "R1 pass 1" and so on. */
  columns: string[]
  measures: MeasureResult[]
}

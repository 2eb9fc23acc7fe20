/**
 * Result DTOs of the measurement engine (shared/measurement), shared by the command line, the
 * API and the client. Angles are degrees, lengths are mm or image pixels as the key says,
 * percentages are 0–100 based. A segment key is present only when the segment can be computed
 * (its upper vertebra's four corners and its lower vertebra's superior endplate corners). A
 * value whose landmarks or calibration are missing is null; its key is still present
 * (measurement-reference §10), except `slipAngleDeg`, present only at L5-S1 when `S1.pw` is
 * given.
 */

/** The five lumbar motion segments, upper vertebra first. */
export type SegmentName = 'L1-L2' | 'L2-L3' | 'L3-L4' | 'L4-L5' | 'L5-S1'

/** Meyerding grade (Meyerding 1932 [M]); V is spondyloptosis. A slip ≤ 0 % has no grade. */
export type MeyerdingGrade = 'I' | 'II' | 'III' | 'IV' | 'V'

/** Direction of the slip after rounding to 0.1 %: positive anterolisthesis, negative retro. */
export type SlipDirection = 'anterolisthesis' | 'retrolisthesis' | 'none'

/** SRS-Schwab PI−LL modifier (Schwab et al. 2012 [V-sec]): < 10°, 10–20°, > 20°. */
export type PiLlBand = '0' | '+' | '++'

/** Point-to-point disc heights of one segment; mean is the two-point (Dabbs) mean. */
export interface DiscHeights {
  anterior: number | null
  middle: number | null
  posterior: number | null
  mean: number | null
}

/** Measures of one motion segment (measurement-reference §3, §7). */
export interface SegmentMeasurement {
  /** 100·d/|W.as − W.ps|; positive anterolisthesis, negative retrolisthesis (Taillard). */
  slipPercent: number | null
  /** Slip distance d in mm; null when uncalibrated. */
  slipMm: number | null
  /** Slip distance d in pixels of the image grid (not proportional to mm for non-square pixels). */
  slipPx: number | null
  /** Meyerding grade from the slip rounded to 0.1 % half up; null for no slip or no data. */
  meyerdingGrade: MeyerdingGrade | null
  /** Direction after the same rounding; null without data. */
  slipDirection: SlipDirection | null
  /** Slip > 50 % (after rounding; Kasliwal et al. [V]). */
  highGrade: boolean | null
  /** Cobb angle from U's superior to W's inferior endplate (S1: superior); lordosis positive. */
  segmentalLordosisDeg: number | null
  /** Angle between U's inferior and W's superior endplate; lordosis positive. */
  discAngleDeg: number | null
  discHeightPx: DiscHeights
  /** Null when the document has no calibration. */
  discHeightMm: DiscHeights | null
  /** Boxall slip angle, kyphosis positive; key present only at L5-S1 when S1.pw is given. */
  slipAngleDeg?: number | null
  /** Cage superior minus inferior surface angle, lordosis positive; null without cage points. */
  cageLordosisDeg: number | null
  /** Implant marker position along W's superior endplate, % of its depth from the posterior edge. */
  implantPositionPercent: number | null
  /** Marker offset from the endplate midpoint in mm, negative = posterior; null uncalibrated. */
  implantOffsetMm: number | null
}

/**
 * Implant centring of one segment on a frontal (AP) film (measurement-reference §11) [D]. With
 * e = unit((U.ir − U.il) + (W.sr − W.sl)), m the mean of the four endplate corners and q the
 * midpoint of the implant's two ends: the lateral offset is (q − m)·e, positive toward the `r`
 * side (the side nearer the image's right edge; which patient side that is comes from the
 * film's Patient Orientation). Present when the four endplate corners are placed; implant
 * values null without both implant ends, mm values null without calibration.
 */
export interface FrontalSegmentMeasurement {
  /** mean(|U.ir − U.il|, |W.sr − W.sl|) in mm; null when uncalibrated. */
  endplateWidthMm: number | null
  /** (q − m)·e in mm, positive toward the r side; null uncalibrated or without the implant. */
  lateralOffsetMm: number | null
  /** The same in pixels of the image grid (projected on the pixel-space e). */
  lateralOffsetPx: number | null
  /** 100 · offset / endplate width, positive toward the r side. */
  lateralOffsetPercent: number | null
  /** Unsigned angle between e and tdr.r − tdr.l, degrees [0, 180]. */
  implantTiltDeg: number | null
  /** Unsigned angle between U.il→U.ir and W.sl→W.sr, degrees [0, 180]. */
  segmentCoronalAngleDeg: number | null
  /**
   * 100 · ((U.sp − mid(U.il, U.ir))·e) / (w/2): the spinous process off the body midline, % of
   * the half-width, positive toward the r side; a film-rotation check (common practice), not a
   * measure. Null without U.sp.
   */
  rotationPercent: number | null
}

/** Pelvic parameters (Legaye et al. 1998 [V]); null members when no hip axis is given. */
export interface PelvisMeasurement {
  incidenceDeg: number | null
  tiltDeg: number | null
  sacralSlopeDeg: number
}

/** Where the mm scale came from: the document's spacing, or none. */
export interface CalibrationSummary {
  rowMm: number
  columnMm: number
  square: boolean
}

/** The full result of `computeMeasurements` (measurement-reference §10 contract plus extras). */
export interface MeasurementResult {
  /** Only the segments that could be computed. */
  segments: Partial<Record<SegmentName, SegmentMeasurement>>
  /** L1 superior to S1 superior endplate, lordosis positive (Polly et al. 1996 [V]). */
  lumbarLordosisDeg: number | null
  /** L4 superior to S1 superior endplate, lordosis positive (Yukawa et al. 2019 [V]). */
  distalLordosisDeg: number | null
  /** Null when the S1 endplate is missing. */
  pelvis: PelvisMeasurement | null
  /** PI − L1–S1 lordosis. */
  piLlMismatchDeg: number | null
  /** SRS-Schwab modifier of the mismatch. */
  piLlBand: PiLlBand | null
  /** 0.54·PI + 27.6 (Le Huec & Hasegawa 2016 [V]). */
  targetLordosisDeg: number | null
  /** The spacing used for every mm value; null when uncalibrated (mm values are then null). */
  calibration: CalibrationSummary | null
  /**
   * Frontal (AP) film: implant centring of each segment whose four endplate corners are placed;
   * `{}` for a lateral film.
   */
  frontal: Partial<Record<SegmentName, FrontalSegmentMeasurement>>
}

/** A 95 % interval around a value from first-order propagation of landmark placement error. */
export interface ValueInterval {
  value: number
  standardDeviation: number
  low: number
  high: number
}

/**
 * The shape of `T` with every number replaced by its interval (null when the value could not be
 * differentiated, a degenerate configuration); strings, booleans and nulls are kept as they are.
 */
export type IntervalTree<T> = T extends number
  ? ValueInterval | null
  : T extends readonly unknown[]
    ? { [K in keyof T]: IntervalTree<T[K]> }
    : T extends object
      ? { [K in keyof T]: IntervalTree<T[K]> }
      : T

/** Probability of each Meyerding outcome under the normal approximation of the slip. */
export interface MeyerdingProbabilities {
  none: number
  I: number
  II: number
  III: number
  IV: number
  V: number
}

/** Grade probabilities of one segment, and whether a neighbouring grade has ≥ 10 %. */
export interface MeyerdingUncertainty {
  probabilities: MeyerdingProbabilities
  borderline: boolean
}

/** The result of `computeUncertainty`. */
export interface UncertaintyResult {
  method: 'first-order propagation, central-difference Jacobian over all landmark coordinates'
  /** SD of each landmark coordinate, per axis, in the unit named. */
  sigma: { value: number; unit: 'mm' | 'px' }
  /** z of the two-sided 95 % interval. */
  z: number
  measurements: IntervalTree<MeasurementResult>
  /** One key per measured segment; null when its slip interval could not be formed. */
  meyerding: Partial<Record<SegmentName, MeyerdingUncertainty | null>>
}

/** Identifier of a published instability criterion. */
export type InstabilityCriterionId = 'white-panjabi-1990' | 'dupuis-1985' | 'ide-translation-5mm'

/** One criterion applied to one segment's flexion/extension pair. */
export interface InstabilityCriterionResult {
  id: InstabilityCriterionId
  source: string
  translationThresholdMm: number | null
  translationThresholdPercent: number | null
  angulationThresholdDeg: number | null
  translationFlagged: boolean | null
  angulationFlagged: boolean | null
  /** True when any part is flagged; null when no part is flagged and a part could not be evaluated. */
  flagged: boolean | null
}

/** Motion of one segment between a flexion and an extension film (measurement-reference §6). */
export interface MotionSegmentResult {
  rangeOfMotionDeg: number | null
  translationMm: number | null
  /** |slip % flexion − slip % extension|: each film normalised by its own endplate depth. */
  translationPercent: number | null
  criteria: InstabilityCriterionResult[]
}

export interface MotionPairResult {
  /** Only the segments measured on both films. */
  segments: Partial<Record<SegmentName, MotionSegmentResult>>
}

/** Loss of disc height against a baseline (positive = lower now), and the flags. */
export interface SubsidenceSegmentResult {
  lossMm: DiscHeights
  anteriorFlagged: boolean | null
  posteriorFlagged: boolean | null
  meanFlagged: boolean | null
  /** True when any of the three is flagged. */
  subsided: boolean | null
}

export interface SubsidenceResult {
  thresholdMm: number
  source: string
  /** Only the segments measured on both readings. */
  segments: Partial<Record<SegmentName, SubsidenceSegmentResult>>
}

/** Which patient side the image's right edge shows on a frontal film, when the file says. */
export type FrontalImageRightSide = 'patient-left' | 'patient-right' | 'unknown'

/** The threshold check of each frontal segment, with the side naming of the film. */
export interface ImplantCentringResult {
  /** Flag a lateral offset above this many mm (a site setting, default 3 mm). */
  thresholdMm: number
  source: string
  /** From DICOM Patient Orientation; 'unknown' means offsets are named "image right". */
  imageRightSide: FrontalImageRightSide
  /** One entry per measured frontal segment: null when the offset has no mm value. */
  segments: Partial<Record<SegmentName, { offCentre: boolean | null }>>
}

/** Treatments a plan can record for a segment. */
export type PlannedTreatment =
  'disc replacement' | 'interbody fusion' | 'posterior fusion' | 'decompression' | 'none'

/** Identifier of a disc-replacement plan check (measurement-reference §9). */
export type PlanCheckId =
  | 'pars-defect'
  | 'slip-grade-ii-or-more'
  | 'facet-degeneration'
  | 'dynamic-translation-over-5mm'
  | 'osteoporosis'
  | 'residual-disc-height-under-3mm'

/** One plan check: flagged true/false, or null when its finding was not recorded. */
export interface PlanCheckFlag {
  id: PlanCheckId
  label: string
  flagged: boolean | null
  source: string
}

/** The plan's expected lordosis beside the target; an estimate, never a prediction. */
export interface PlannedLordosisEstimate {
  expectedLordosisDeg: number | null
  targetLordosisDeg: number | null
  /** expected − target. */
  differenceDeg: number | null
  isEstimate: true
  source: string
}

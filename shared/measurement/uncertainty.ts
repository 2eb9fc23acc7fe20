import { angleWrapDeg } from '../geometry/angle'
import { pointPxToMm } from '../geometry/transform'
import type { Point } from '../geometry/types'
import type { LandmarkDocument } from '../types/landmarks'
import type {
  IntervalTree,
  MeasurementResult,
  MeyerdingGrade,
  MeyerdingUncertainty,
  SegmentName,
  UncertaintyResult,
  ValueInterval,
} from '../types/measurement'
import { measurementParts, measurePrepared } from './compute-measurements'
import { FRONTAL_UNSIGNED_ANGLE_KEYS } from './frontal'
import { SEGMENT_NAMES } from './landmark-names'
import { meyerdingGradeFromSlipPercent, MEYERDING_UPPER_BOUNDS_PERCENT } from './meyerding'
import { normalCdf } from './normal-distribution'
import { landmarkReadsOf } from './landmark-reads'
import { mapNumericLeaves, numberAtPath, numericLeafPaths, type LeafPath } from './numeric-leaves'
import { parseLandmarkDocument } from './parse-landmark-document'
import { prepareDocument, type PreparedPoints } from './prepared-points'

/** Site default SD of each landmark coordinate, per axis, on a calibrated film (mm). */
export const DEFAULT_SIGMA_MM = 1
/** Site default SD of each landmark coordinate, per axis, on an uncalibrated film (px). */
export const DEFAULT_SIGMA_PX = 3
/** z of a two-sided 95 % normal interval. */
export const Z_95 = 1.959963984540054
/** A neighbouring grade with at least this probability makes a grade borderline (§8). */
export const BORDERLINE_PROBABILITY = 0.1
/** Central-difference step as a fraction of σ: small enough for a first derivative, large
 * enough that rounding error (≈ 1e-16·|f|/h) stays negligible. */
const STEP_FRACTION_OF_SIGMA = 1e-3

export interface UncertaintyOptions {
  /** SD per coordinate in mm when the document is calibrated; default 1 mm. */
  sigmaMm?: number
  /** SD per coordinate in image px when it is not; default 3 px. */
  sigmaPx?: number
}

function checkSigma(value: number, name: string): number {
  if (!Number.isFinite(value) || value < 0) {
    throw new RangeError(`${name} must be a finite number ≥ 0, got ${value}`)
  }
  return value
}

function perturbed(prepared: PreparedPoints, name: string, pointPx: Point): PreparedPoints {
  const px = { ...prepared.px, [name]: pointPx }
  if (prepared.spacing === null) return { spacing: null, px, work: px }
  return {
    spacing: prepared.spacing,
    px,
    work: { ...prepared.work, [name]: pointPxToMm(pointPx, prepared.spacing) },
  }
}

const GRADE_ORDER: readonly (MeyerdingGrade | 'none')[] = ['none', 'I', 'II', 'III', 'IV', 'V']

/**
 * Probabilities of each Meyerding outcome for a slip ~ N(slipPercent, sd²), on the raw slip
 * scale that matches the grading rule: rounding to 0.1 % half up puts a boundary B at B + 0.05.
 * `borderline` when a grade next to the point grade has ≥ 10 % (measurement-reference §8).
 */
export function meyerdingUncertainty(slipPercent: number, sdPercent: number): MeyerdingUncertainty {
  const cuts = [0, ...MEYERDING_UPPER_BOUNDS_PERCENT].map((bound) => bound + 0.05)
  const cdf = cuts.map((cut) => normalCdf(cut, slipPercent, sdPercent))
  // A point mass exactly at a cut belongs above it (the rounded value is then B + 0.1).
  const below = (i: number): number =>
    sdPercent === 0 ? (slipPercent < (cuts[i] as number) ? 1 : 0) : (cdf[i] as number)
  const masses = GRADE_ORDER.map((_, i) => {
    const upper = i < cuts.length ? below(i) : 1
    const lower = i === 0 ? 0 : below(i - 1)
    return Math.max(0, upper - lower)
  })
  const gradeIndex = GRADE_ORDER.indexOf(meyerdingGradeFromSlipPercent(slipPercent) ?? 'none')
  const neighbours = [masses[gradeIndex - 1] ?? 0, masses[gradeIndex + 1] ?? 0]
  const [none, I, II, III, IV, V] = masses as [number, number, number, number, number, number]
  return {
    probabilities: { none, I, II, III, IV, V },
    borderline: neighbours.some((p) => p >= BORDERLINE_PROBABILITY),
  }
}

/**
 * 95 % intervals of every numeric value of `computeMeasurements(doc)` from landmark placement
 * error (measurement-reference §8), and the probability of each Meyerding grade.
 *
 * Method: first-order (delta-method) propagation. Each input coordinate — every landmark's x
 * and y in image px, rim and implant points included — has independent error with SD σ:
 * `sigmaMm` (default 1 mm, converted to px per axis with the row and column spacing) when the
 * document is calibrated, else `sigmaPx` (default 3 px). The Jacobian of all outputs is taken
 * numerically by central differences with step 1e-3·σ; angle differences are wrapped so a value
 * near ±180° is not broken. SD = sqrt(Σ (∂f/∂xᵢ · σᵢ)²); the interval is value ± 1.96·SD.
 * Deterministic (no sampling). Each landmark is moved only in the parts of the result that read
 * it (each segment, the whole-spine measures, each frontal segment), which gives the same sums
 * as moving it in the whole result at a fraction of the evaluations.
 * Being linear, it is accurate while σ is small against the endplate lengths; classifications
 * use the normal approximation of the slip. The unsigned frontal angles (implant tilt, segment
 * coronal angle) take their SD from the signed angle, and their interval is clipped at 0°. An
 * interval is null where its value is null, or
 * where a perturbation makes the value undefined (a degenerate configuration). Throws `LandmarkDocumentError` like
 * `computeMeasurements`, and RangeError for a negative or non-finite σ.
 */
export function computeUncertainty(
  doc: LandmarkDocument,
  options: UncertaintyOptions = {},
): UncertaintyResult {
  const parsed = parseLandmarkDocument(doc)
  const prepared = prepareDocument(parsed)
  const sigmaMm = checkSigma(options.sigmaMm ?? DEFAULT_SIGMA_MM, 'sigmaMm')
  const sigmaPx = checkSigma(options.sigmaPx ?? DEFAULT_SIGMA_PX, 'sigmaPx')
  const spacing = prepared.spacing
  const sigmaXPx = spacing === null ? sigmaPx : sigmaMm / spacing.columnMm
  const sigmaYPx = spacing === null ? sigmaPx : sigmaMm / spacing.rowMm

  const base = measurePrepared(prepared)
  // Unsigned frontal angles are differentiated through their signed form (|θ| has no
  // derivative at 0); both trees have the same keys in the same order.
  const paths = numericLeafPaths(base)
  const isAngle = paths.map((path) => (path[path.length - 1] ?? '').endsWith('Deg'))
  const isFolded = paths.map(
    (path) => path[0] === 'frontal' && FRONTAL_UNSIGNED_ANGLE_KEYS.has(path[path.length - 1] ?? ''),
  )
  const variance = new Float64Array(paths.length)
  const broken = new Uint8Array(paths.length)

  // Each landmark is moved only in the parts of the result that read it: a part that does not
  // read a landmark has a derivative of exactly 0 for it, so skipping the part changes no sum.
  // Per value, the terms are added in the same landmark order as over the whole result.
  const parts = measurementParts('signed')
  const ownerOf = (path: LeafPath): number => {
    const owner = parts.findIndex(
      (part) => part.at.length > 0 && part.at.every((key, i) => path[i] === key),
    )
    return owner >= 0 ? owner : parts.findIndex((part) => part.at.length === 0)
  }
  const owners = paths.map(ownerOf)
  parts.forEach((part, p) => {
    const leaves = owners.flatMap((owner, k) => (owner === p ? [k] : []))
    if (leaves.length === 0) return
    const within = leaves.map((k) => (paths[k] as LeafPath).slice(part.at.length))
    const reads = landmarkReadsOf(part.measure, prepared)
    for (const name of Object.keys(prepared.px)) {
      if (reads !== 'all' && !reads.has(name)) continue
      const point = prepared.px[name] as Point
      for (const axis of [0, 1] as const) {
        const sigma = axis === 0 ? sigmaXPx : sigmaYPx
        if (sigma === 0) continue
        const step = sigma * STEP_FRACTION_OF_SIGMA
        const shifted = (delta: number): Point =>
          axis === 0 ? [point[0] + delta, point[1]] : [point[0], point[1] + delta]
        const plus = part.measure(perturbed(prepared, name, shifted(step)))
        const minus = part.measure(perturbed(prepared, name, shifted(-step)))
        leaves.forEach((k, j) => {
          const path = within[j] as LeafPath
          const difference = numberAtPath(plus, path) - numberAtPath(minus, path)
          if (!Number.isFinite(difference)) {
            broken[k] = 1
            return
          }
          const derivative = (isAngle[k] ? angleWrapDeg(difference) : difference) / (2 * step)
          variance[k] = (variance[k] as number) + (derivative * sigma) ** 2
        })
      }
    }
  })

  const standardDeviations = Array.from(variance, (v, k) => (broken[k] ? null : Math.sqrt(v)))
  const measurements = mapNumericLeaves(base, (value, k): ValueInterval | null => {
    const sd = standardDeviations[k]
    if (sd === null || sd === undefined) return null
    // An unsigned angle cannot go below 0: its interval is the signed one folded at 0.
    const low = isFolded[k] ? Math.max(0, value - Z_95 * sd) : value - Z_95 * sd
    return { value, standardDeviation: sd, low, high: value + Z_95 * sd }
  }) as IntervalTree<MeasurementResult>

  // Keys follow the measured segments; null where the slip interval could not be formed.
  const meyerding: Partial<Record<SegmentName, MeyerdingUncertainty | null>> = {}
  for (const segment of SEGMENT_NAMES) {
    const intervals = measurements.segments[segment]
    if (intervals === undefined) continue
    const slip = intervals.slipPercent
    meyerding[segment] =
      slip === null ? null : meyerdingUncertainty(slip.value, slip.standardDeviation)
  }

  return {
    method: 'first-order propagation, central-difference Jacobian over all landmark coordinates',
    sigma: spacing === null ? { value: sigmaPx, unit: 'px' } : { value: sigmaMm, unit: 'mm' },
    z: Z_95,
    measurements,
    meyerding,
  }
}

import type { LandmarkDocument } from '../types/landmarks'
import type { MeasurementResult, SegmentMeasurement, SegmentName } from '../types/measurement'
import { piLlBandFromMismatchDeg, targetLordosisDeg } from './alignment'
import { hipAxis } from './femoral-head'
import { measureFrontal, measureFrontalSegment, type FrontalAngleMode } from './frontal'
import { SEGMENTS } from './landmark-names'
import { lordosisToSacrumDeg } from './lordosis'
import { parseLandmarkDocument } from './parse-landmark-document'
import { pelvicParameters } from './pelvis'
import { prepareDocument, type PreparedPoints } from './prepared-points'
import { measureSegment } from './segment-measures'

/**
 * The measures that belong to no single segment: lordosis to the sacrum, the pelvic parameters
 * and what follows from them, and the calibration.
 */
export function measureWholeSpine(
  prepared: PreparedPoints,
): Omit<MeasurementResult, 'segments' | 'frontal'> {
  const { work, spacing } = prepared
  const lumbarLordosisDeg = lordosisToSacrumDeg(work, 'L1')
  const sacrumPs = work['S1.ps']
  const sacrumAs = work['S1.as']
  const pelvis =
    sacrumPs === undefined || sacrumAs === undefined
      ? null
      : pelvicParameters(sacrumPs, sacrumAs, hipAxis(work))
  const incidence = pelvis?.incidenceDeg ?? null
  const piLlMismatchDeg =
    incidence === null || lumbarLordosisDeg === null ? null : incidence - lumbarLordosisDeg
  return {
    lumbarLordosisDeg,
    distalLordosisDeg: lordosisToSacrumDeg(work, 'L4'),
    pelvis,
    piLlMismatchDeg,
    piLlBand: piLlMismatchDeg === null ? null : piLlBandFromMismatchDeg(piLlMismatchDeg),
    targetLordosisDeg: incidence === null ? null : targetLordosisDeg(incidence),
    calibration:
      spacing === null
        ? null
        : {
            rowMm: spacing.rowMm,
            columnMm: spacing.columnMm,
            square: spacing.rowMm === spacing.columnMm,
          },
  }
}

/**
 * Every measure of already prepared points, with no validation: the inner step that
 * `computeMeasurements` and the uncertainty propagation share. `frontalAngles: 'signed'` gives
 * the frontal coronal angles with their sign, for differentiation only (see `FrontalAngleMode`).
 */
export function measurePrepared(
  prepared: PreparedPoints,
  frontalAngles: FrontalAngleMode = 'unsigned',
): MeasurementResult {
  // Only computable segments get a key, so a reader never mistakes an empty one for a result.
  const segments: Partial<Record<SegmentName, SegmentMeasurement>> = {}
  for (const spec of SEGMENTS) {
    const segment = measureSegment(spec, prepared)
    if (segment !== null) segments[spec.name] = segment
  }
  return {
    segments,
    ...measureWholeSpine(prepared),
    frontal: measureFrontal(prepared, frontalAngles),
  }
}

/** One piece of `measurePrepared`'s result that is computed on its own: `at` is where it sits. */
export interface MeasurementPart {
  readonly at: readonly string[]
  readonly measure: (prepared: PreparedPoints) => object | null
}

/**
 * `measurePrepared` as the pieces it is made of: each segment's lateral measures, the
 * whole-spine measures (`at` empty: every key outside `segments` and `frontal`) and each
 * segment's frontal measures. Each piece reads a few landmarks only, which lets the uncertainty
 * propagation move each landmark in the pieces that read it rather than in the whole result.
 */
export function measurementParts(frontalAngles: FrontalAngleMode): MeasurementPart[] {
  return [
    ...SEGMENTS.map((spec) => ({
      at: ['segments', spec.name],
      measure: (prepared: PreparedPoints) => measureSegment(spec, prepared),
    })),
    { at: [], measure: measureWholeSpine },
    ...SEGMENTS.map((spec) => ({
      at: ['frontal', spec.name],
      measure: (prepared: PreparedPoints) =>
        measureFrontalSegment(spec.name, spec.upper, spec.lower, prepared, frontalAngles),
    })),
  ]
}

/**
 * Measures a landmark document (measurement-reference §3, §4, §7 and §11 for a frontal film,
 * and the JSON contract of §10). The document is validated first, so untrusted input is fine: it throws
 * `LandmarkDocumentError` for anything `parseLandmarkDocument` refuses. Angles in degrees
 * (lordosis positive, slip angle kyphosis positive), slips in % of the lower endplate depth, mm
 * values null when the document has no `mmPerPixel`. A segment is present only when it can be
 * computed (U's four corners and W's `as` and `ps`); every other key is present, and a value
 * whose landmarks or calibration are missing is null; no value is NaN or infinite. No uncertainty: see
 * `computeUncertainty`.
 */
export function computeMeasurements(doc: LandmarkDocument): MeasurementResult {
  return measurePrepared(prepareDocument(parseLandmarkDocument(doc)))
}

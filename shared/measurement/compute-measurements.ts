import type { LandmarkDocument } from '../types/landmarks'
import type { MeasurementResult, SegmentMeasurement, SegmentName } from '../types/measurement'
import { piLlBandFromMismatchDeg, targetLordosisDeg } from './alignment'
import { hipAxis } from './femoral-head'
import { measureFrontal, type FrontalAngleMode } from './frontal'
import { SEGMENTS } from './landmark-names'
import { lordosisToSacrumDeg } from './lordosis'
import { parseLandmarkDocument } from './parse-landmark-document'
import { pelvicParameters } from './pelvis'
import { prepareDocument, type PreparedPoints } from './prepared-points'
import { measureSegment } from './segment-measures'

/**
 * Every measure of already prepared points, with no validation: the inner step that
 * `computeMeasurements` and the uncertainty propagation share. `frontalAngles: 'signed'` gives
 * the frontal coronal angles with their sign, for differentiation only (see `FrontalAngleMode`).
 */
export function measurePrepared(
  prepared: PreparedPoints,
  frontalAngles: FrontalAngleMode = 'unsigned',
): MeasurementResult {
  const { work, spacing } = prepared
  // Only computable segments get a key, so a reader never mistakes an empty one for a result.
  const segments: Partial<Record<SegmentName, SegmentMeasurement>> = {}
  for (const spec of SEGMENTS) {
    const segment = measureSegment(spec, prepared)
    if (segment !== null) segments[spec.name] = segment
  }
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
    segments,
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
    frontal: measureFrontal(prepared, frontalAngles),
  }
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

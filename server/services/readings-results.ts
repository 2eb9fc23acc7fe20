import {
  computeMeasurements,
  computeMotionPair,
  computeSubsidence,
  computeUncertainty,
  DEFAULT_SIGMA_PX,
} from '../../shared/measurement/index'
import type { ImageRow } from '../db/images'
import type { LandmarkDocument, PixelPoint } from '../../shared/types/landmarks'
import type { SubsidenceResult } from '../../shared/types/measurement'
import type { ReadingCalibration, ReadingResults } from '../../shared/types/readings'
import type { TemplateOptions } from '../../shared/readings/templates'
import type { ReadingTemplate } from '../../shared/types/domain'

/** The spacing a film has now, as a reading records it. */
export function calibrationOf(image: ImageRow): ReadingCalibration {
  const mmPerPixel: [number, number] | null =
    image.mmPerPixelRow !== null && image.mmPerPixelColumn !== null
      ? [image.mmPerPixelRow, image.mmPerPixelColumn]
      : null
  return { mmPerPixel, source: mmPerPixel === null ? 'none' : image.spacingSource }
}

/** The engine's landmark document: the rater's points with the film's [row, column] spacing. */
export function landmarkDocument(
  points: Record<string, PixelPoint>,
  calibration: ReadingCalibration,
): LandmarkDocument {
  return { mmPerPixel: calibration.mmPerPixel, points }
}

export interface ResultsInput {
  template: ReadingTemplate
  options: TemplateOptions
  document: LandmarkDocument
  /** Motion pair: the extension film's document. */
  pairedDocument: LandmarkDocument | null
  /** Construct check: the baseline reading's document and id, when there is one. */
  baseline: { readingId: number; document: LandmarkDocument } | null
  sigmaMm: number
  subsidenceThresholdMm: number
}

/** Throws when a number is NaN or infinite: such a value must never reach the database. */
function assertFinite(node: unknown, path: string): void {
  if (typeof node === 'number') {
    if (!Number.isFinite(node)) throw new Error(`The engine produced a non-finite value at ${path}`)
  } else if (typeof node === 'object' && node !== null) {
    for (const [key, value] of Object.entries(node)) assertFinite(value, `${path}.${key}`)
  }
}

/** One entry per treated segment, each holding that segment's loss against the baseline. */
function subsidenceBySegment(input: ResultsInput): Record<string, SubsidenceResult> | null {
  if (input.template !== 'construct-check' || input.baseline === null) return null
  const all = computeSubsidence(input.document, input.baseline.document, {
    thresholdMm: input.subsidenceThresholdMm,
  })
  const bySegment: Record<string, SubsidenceResult> = {}
  for (const { segment } of input.options.construct ?? []) {
    const result = all.segments[segment]
    if (result !== undefined)
      bySegment[segment] = {
        thresholdMm: all.thresholdMm,
        source: all.source,
        segments: { [segment]: result },
      }
  }
  return bySegment
}

/**
 * Every result of a reading from the shared engine (the server's copy, never the client's).
 * Throws LandmarkDocumentError for landmarks the engine refuses.
 */
export function computeReadingResults(input: ResultsInput): ReadingResults {
  const measurements = computeMeasurements(input.document)
  const uncertainty = computeUncertainty(input.document, {
    sigmaMm: input.sigmaMm,
    sigmaPx: DEFAULT_SIGMA_PX,
  })
  const motion =
    input.template === 'motion-pair' && input.pairedDocument !== null
      ? computeMotionPair(input.document, input.pairedDocument)
      : null
  const subsidence = subsidenceBySegment(input)
  const results: ReadingResults = {
    measurements,
    uncertainty,
    motion,
    subsidence,
    subsidenceBaselineReadingId: subsidence === null ? null : (input.baseline?.readingId ?? null),
  }
  assertFinite(results, 'results')
  return results
}

import {
  computeMeasurements,
  computeMotionPair,
  computeSubsidence,
  computeUncertainty,
  DEFAULT_SIGMA_PX,
  implantCentring,
  type FrontalImageRightSide,
} from '../../shared/measurement/index'
import type { ImageRow } from '../db/images'
import type { LandmarkDocument, PixelPoint } from '../../shared/types/landmarks'
import type {
  ReadingCalibration,
  ReadingResults,
  ResultSettings,
} from '../../shared/types/readings'
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
  /** Construct check: candidate baseline readings, earliest first (see findConstructBaselines). */
  baselines: Array<{ readingId: number; document: LandmarkDocument }>
  /** The site settings in force; recorded with the results. */
  settings: ResultSettings
  /** Implant centring: the patient side of the image's right edge (DICOM Patient Orientation). */
  imageRightSide: FrontalImageRightSide
}

/** Throws when a number is NaN or infinite: such a value must never reach the database. */
function assertFinite(node: unknown, path: string): void {
  if (typeof node === 'number') {
    if (!Number.isFinite(node)) throw new Error(`The engine produced a non-finite value at ${path}`)
  } else if (typeof node === 'object' && node !== null) {
    for (const [key, value] of Object.entries(node)) assertFinite(value, `${path}.${key}`)
  }
}

/**
 * One entry per treated segment, each against the earliest baseline that measured that segment:
 * a segment treated at a later operation gets its own first post-op reading as baseline.
 */
function subsidenceBySegment(input: ResultsInput): ReadingResults['subsidence'] {
  if (input.template !== 'construct-check' || input.baselines.length === 0) return null
  const bySegment: NonNullable<ReadingResults['subsidence']> = {}
  for (const { segment } of input.options.construct ?? []) {
    for (const baseline of input.baselines) {
      const all = computeSubsidence(input.document, baseline.document, {
        thresholdMm: input.settings.subsidenceThresholdMm,
      })
      const result = all.segments[segment]
      if (result === undefined) continue
      bySegment[segment] = {
        thresholdMm: all.thresholdMm,
        source: all.source,
        segments: { [segment]: result },
        baselineReadingId: baseline.readingId,
      }
      break
    }
  }
  return Object.keys(bySegment).length > 0 ? bySegment : null
}

/**
 * Every result of a reading from the shared engine (the server's copy, never the client's).
 * Throws LandmarkDocumentError for landmarks the engine refuses.
 */
export function computeReadingResults(input: ResultsInput): ReadingResults {
  const measurements = computeMeasurements(input.document)
  const uncertainty = computeUncertainty(input.document, {
    sigmaMm: input.settings.landmarkSigmaMm,
    sigmaPx: DEFAULT_SIGMA_PX,
  })
  const motion =
    input.template === 'motion-pair' && input.pairedDocument !== null
      ? computeMotionPair(input.document, input.pairedDocument)
      : null
  const subsidence = subsidenceBySegment(input)
  const centring =
    input.template === 'implant-centring'
      ? implantCentring(measurements, {
          thresholdMm: input.settings.implantCentringThresholdMm,
          imageRightSide: input.imageRightSide,
        })
      : null
  const results: ReadingResults = {
    measurements,
    uncertainty,
    motion,
    subsidence,
    subsidenceBaselineReadingId:
      subsidence === null
        ? null
        : Math.min(...Object.values(subsidence).map((entry) => entry.baselineReadingId)),
    centring,
    computedWith: { ...input.settings },
  }
  assertFinite(results, 'results')
  return results
}

import {
  computeMeasurements,
  computeUncertainty,
  LandmarkDocumentError,
} from '../../shared/measurement/index'
import type { MeasurementResult } from '../../shared/types/measurement'
import { HttpError } from '../errors'

/** The engine's refusal of a landmark document, as a 400 that carries the engine's message. */
function asBadRequest(error: unknown): never {
  if (error instanceof LandmarkDocumentError)
    throw new HttpError(400, 'invalid_landmarks', error.message)
  if (error instanceof RangeError) throw new HttpError(400, 'validation_failed', error.message)
  throw error
}

/** Runs the shared engine on an untrusted document: the same JSON as `npm run measure`. */
export function computeFromDocument(document: unknown): MeasurementResult {
  try {
    return computeMeasurements(document as Parameters<typeof computeMeasurements>[0])
  } catch (error) {
    return asBadRequest(error)
  }
}

export function computeWithUncertainty(
  document: unknown,
  sigma: { sigmaMm?: number; sigmaPx?: number },
) {
  try {
    const doc = document as Parameters<typeof computeUncertainty>[0]
    return { ...computeMeasurements(doc), uncertainty: computeUncertainty(doc, sigma) }
  } catch (error) {
    return asBadRequest(error)
  }
}

/** What is wrong with a refused landmark document. */
export type LandmarkDocumentErrorCode =
  | 'bad-structure'
  | 'unknown-landmark'
  | 'non-finite-coordinate'
  | 'non-positive-spacing'
  | 'zero-length-endplate'
  | 'collinear-rim-points'
  | 'incomplete-rim'
  | 'conflicting-femoral-head'
  | 'degenerate-frame'
  | 'crossed-frontal-lines'

/**
 * Thrown by `parseLandmarkDocument` (and so by every compute function) for input it refuses.
 * The message names the problem and the landmark; `code` lets the API map it to a 400 without
 * parsing text.
 */
export class LandmarkDocumentError extends Error {
  readonly code: LandmarkDocumentErrorCode
  /** The landmark (or top-level key) concerned, when there is one. */
  readonly landmark: string | null

  constructor(code: LandmarkDocumentErrorCode, message: string, landmark: string | null = null) {
    super(message)
    this.name = 'LandmarkDocumentError'
    this.code = code
    this.landmark = landmark
  }
}

/**
 * Why an uploaded file could not become a film. `unsupported-*` codes are kinds of file we do not
 * read (the upload route answers 415); the others are files that claim a kind we read but are
 * damaged or empty (422).
 */
export type ImageErrorCode =
  | 'unsupported-file-type'
  | 'unsupported-transfer-syntax'
  | 'unsupported-pixel-format'
  | 'empty-file'
  | 'corrupt-dicom'
  | 'corrupt-image'
  | 'zero-size-image'
  | 'too-many-pixels'
  | 'exceeds-decode-limit'

export class ImageError extends Error {
  readonly code: ImageErrorCode
  readonly status: 415 | 422
  readonly details: Readonly<Record<string, string | number>>

  constructor(
    code: ImageErrorCode,
    message: string,
    details: Record<string, string | number> = {},
  ) {
    super(message)
    this.name = 'ImageError'
    this.code = code
    this.status = code.startsWith('unsupported-') ? 415 : 422
    this.details = details
  }
}

/**
 * The largest film accepted, in pixels: a 43 × 43 cm detector at 0.1 mm is about 18.5 MP and
 * long-length films stitch a few of those, so 80 MP leaves room while a small compressed file
 * cannot unpack into gigabytes of memory.
 */
export const MAX_FILM_PIXELS = 80_000_000

export function tooManyPixels(width: number, height: number): ImageError {
  return new ImageError(
    'too-many-pixels',
    `The film is ${width} × ${height} pixels, more than the ${MAX_FILM_PIXELS / 1e6} million Endplate accepts.`,
    { width, height },
  )
}

export function isImageError(error: unknown): error is ImageError {
  return error instanceof ImageError
}

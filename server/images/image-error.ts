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

export function isImageError(error: unknown): error is ImageError {
  return error instanceof ImageError
}

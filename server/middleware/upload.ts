import { createHash, randomUUID } from 'node:crypto'
import { createWriteStream, mkdirSync } from 'node:fs'
import { rm } from 'node:fs/promises'
import { join } from 'node:path'
import { pipeline } from 'node:stream/promises'
import { Transform } from 'node:stream'
import multer, { type StorageEngine } from 'multer'
import type { ErrorRequestHandler, Request, RequestHandler } from 'express'
import { HttpError } from '../errors'

/** What the upload storage hands the route for each file. */
export interface StreamedUpload {
  /** Temporary path under UPLOAD_DIR/tmp, named randomly, never after the client's name. */
  path: string
  size: number
  sha256: string
  originalName: string
}

/**
 * A multer storage engine that streams each file to a random temporary name while computing its
 * SHA-256, so the film can be filed by content hash without reading it twice.
 */
/** Every temporary file a request started, so a broken upload can remove even half-written ones. */
const TEMP_PATHS = Symbol('uploadTempPaths')
const ABANDONED = Symbol('uploadAbandoned')
/** Bytes of every file of the request so far, against the per-request limit. */
const TOTAL_BYTES = Symbol('uploadTotalBytes')
type TrackedRequest = Request & {
  [TEMP_PATHS]?: string[]
  [ABANDONED]?: boolean
  [TOTAL_BYTES]?: number
}

export interface UploadLimits {
  /** Largest single file, in megabytes. */
  fileMaxMb: number
  /** All files of one request together, in megabytes. */
  requestMaxMb: number
}

/** At most this many files per request, and this many other form fields. */
export const MAX_FILES_PER_UPLOAD = 20
const MAX_FIELDS_PER_UPLOAD = 50

const megabytes = (mb: number) => Math.round(mb * 1024 * 1024)

function requestTooLarge(limits: UploadLimits): HttpError {
  return new HttpError(
    413,
    'too_large',
    `The files of one upload may add up to ${limits.requestMaxMb} MB at most; send fewer at a time.`,
  )
}

function hashingDiskStorage(tmpDir: string, limits: UploadLimits): StorageEngine {
  return {
    _handleFile(req, file, callback) {
      // Made on every upload: an operator clearing the uploads folder must not break the next one.
      mkdirSync(tmpDir, { recursive: true })
      const path = join(tmpDir, `${randomUUID()}.upload`)
      ;((req as TrackedRequest)[TEMP_PATHS] ??= []).push(path)
      const hash = createHash('sha256')
      let size = 0
      const tracked = req as TrackedRequest
      const counter = new Transform({
        transform(chunk: Buffer, _encoding, next) {
          tracked[TOTAL_BYTES] = (tracked[TOTAL_BYTES] ?? 0) + chunk.length
          if (tracked[TOTAL_BYTES] > megabytes(limits.requestMaxMb)) {
            next(requestTooLarge(limits))
            return
          }
          hash.update(chunk)
          size += chunk.length
          next(null, chunk)
        },
      })
      pipeline(file.stream, counter, createWriteStream(path))
        .then(async () => {
          // The request failed while this file was still being written: nobody will claim it.
          if ((req as TrackedRequest)[ABANDONED]) await rm(path, { force: true })
          callback(null, { path, size, sha256: hash.digest('hex') } as Partial<Express.Multer.File>)
        })
        .catch(async (error: unknown) => {
          await rm(path, { force: true })
          callback(error as Error)
        })
    },
    _removeFile(_req, file, callback) {
      rm(file.path, { force: true }).then(() => callback(null), callback)
    },
  }
}

/** Keeps a display name only: no folders, no control characters, at most 255 characters. */
export function safeDisplayName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? ''
  const cleaned = base.replace(/[\u0000-\u001f\u007f]/g, '').trim()
  return cleaned.slice(0, 255) || 'unnamed'
}

// RFC 2046 §5.1.1: the boundary is 1 to 70 characters, quoted or a bare token.
const BOUNDARY_PARAMETER = /;\s*boundary=(?:"[^"]{1,70}"|[^\s;"]{1,70})\s*(?:;|$)/i

/**
 * Refuses, in our own words and before any byte is read, a multipart upload whose type carries
 * no boundary (RFC 7578 §4.1), which busboy would throw on. A body that is not multipart at all
 * passes: multer skips it and the service answers that no file was attached.
 */
function requireMultipartBoundary(req: Request): void {
  const type = req.get('content-type') ?? ''
  if (/^\s*multipart\//i.test(type) && !BOUNDARY_PARAMETER.test(type)) {
    throw new HttpError(
      400,
      'upload_refused',
      'The upload names no multipart boundary (Content-Type: multipart/form-data; boundary=...), so its parts cannot be read.',
    )
  }
}

/** A declared body larger than the request limit is refused before a byte is read. */
function refuseDeclaredOversize(req: Request, limits: UploadLimits): void {
  const declared = Number(req.get('content-length') ?? NaN)
  if (Number.isFinite(declared) && declared > megabytes(limits.requestMaxMb))
    throw requestTooLarge(limits)
}

export function filmUpload(tmpDir: string, limits: UploadLimits): RequestHandler {
  const parse = multer({
    storage: hashingDiskStorage(tmpDir, limits),
    limits: {
      fileSize: megabytes(limits.fileMaxMb),
      files: MAX_FILES_PER_UPLOAD,
      fields: MAX_FIELDS_PER_UPLOAD,
      parts: MAX_FILES_PER_UPLOAD + MAX_FIELDS_PER_UPLOAD,
    },
  }).array('file', MAX_FILES_PER_UPLOAD)
  return (req, res, next) => {
    requireMultipartBoundary(req)
    refuseDeclaredOversize(req, limits)
    parse(req, res, next)
  }
}

export function uploadsOf(files: unknown): StreamedUpload[] {
  return ((files as Array<Express.Multer.File & { sha256: string }>) ?? []).map((file) => ({
    path: file.path,
    size: file.size,
    sha256: file.sha256,
    originalName: safeDisplayName(file.originalname),
  }))
}

/**
 * Busboy's messages for a body it could not parse, in our words; the parser's own text never
 * reaches the client.
 */
const MULTIPART_PROBLEMS: Array<[pattern: RegExp, message: string]> = [
  [
    /unexpected end of (form|file)/i,
    'The upload ended before its last part was complete (the connection broke or the body was cut short). Send it again.',
  ],
  [/malformed part header/i, 'A part of the upload has a header that cannot be read.'],
  [/boundary not found/i, 'The upload names no multipart boundary, so its parts cannot be read.'],
]

function multipartProblem(error: unknown): string {
  const text = error instanceof Error ? error.message : ''
  const known = MULTIPART_PROBLEMS.find(([pattern]) => pattern.test(text))
  return known ? known[1] : 'The upload could not be read as multipart/form-data.'
}

function multerProblem(error: multer.MulterError, limits: UploadLimits): [number, string] {
  switch (error.code) {
    case 'LIMIT_FILE_SIZE':
      return [413, `A file is larger than the ${limits.fileMaxMb} MB limit.`]
    case 'LIMIT_FILE_COUNT':
      return [400, `At most ${MAX_FILES_PER_UPLOAD} files can be uploaded at once.`]
    case 'LIMIT_PART_COUNT':
      return [
        400,
        `The upload has too many parts: at most ${MAX_FILES_PER_UPLOAD} files and ${MAX_FIELDS_PER_UPLOAD} other fields.`,
      ]
    case 'LIMIT_FIELD_COUNT':
      return [400, `The upload has more than ${MAX_FIELDS_PER_UPLOAD} form fields.`]
    case 'LIMIT_FIELD_KEY':
      return [400, 'A form field of the upload has too long a name.']
    case 'LIMIT_FIELD_VALUE':
      return [400, 'A form field of the upload has too long a value.']
    case 'LIMIT_UNEXPECTED_FILE':
      return [400, 'Files must be sent in the multipart field "file".']
    default:
      return [400, 'The upload has a form field that cannot be read.']
  }
}

/** Multer's and busboy's errors as clear 4xx answers (partial files are removed first). */
export function uploadErrorHandler(limits: UploadLimits): ErrorRequestHandler {
  return async (error, req, _res, next) => {
    // Multer removes the files it finished; a file cut off mid-stream is removed here.
    ;(req as TrackedRequest)[ABANDONED] = true
    await Promise.all(
      ((req as TrackedRequest)[TEMP_PATHS] ?? []).map((path) => rm(path, { force: true })),
    )
    if (error instanceof HttpError) {
      next(error)
      return
    }
    if (error instanceof multer.MulterError) {
      const [status, message] = multerProblem(error, limits)
      next(new HttpError(status, status === 413 ? 'too_large' : 'upload_refused', message))
      return
    }
    // Multer marks every error it aborted an upload with (busboy's "Unexpected end of form",
    // a malformed part header): the client sent a broken body, not a server fault.
    const fromMultipart = typeof error === 'object' && error !== null && 'storageErrors' in error
    next(fromMultipart ? new HttpError(400, 'upload_refused', multipartProblem(error)) : error)
  }
}

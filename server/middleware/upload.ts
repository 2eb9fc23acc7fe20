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
type TrackedRequest = Request & { [TEMP_PATHS]?: string[]; [ABANDONED]?: boolean }

function hashingDiskStorage(tmpDir: string): StorageEngine {
  return {
    _handleFile(req, file, callback) {
      // Made on every upload: an operator clearing the uploads folder must not break the next one.
      mkdirSync(tmpDir, { recursive: true })
      const path = join(tmpDir, `${randomUUID()}.upload`)
      ;((req as TrackedRequest)[TEMP_PATHS] ??= []).push(path)
      const hash = createHash('sha256')
      let size = 0
      const counter = new Transform({
        transform(chunk: Buffer, _encoding, next) {
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

export function filmUpload(tmpDir: string, maxMegabytes: number): RequestHandler {
  const parse = multer({
    storage: hashingDiskStorage(tmpDir),
    limits: { fileSize: Math.round(maxMegabytes * 1024 * 1024), files: 20, fields: 50 },
  }).array('file', 20)
  return (req, res, next) => {
    requireMultipartBoundary(req)
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

/** Multer's own errors as clear 4xx answers (it has already removed the partial files). */
export function uploadErrorHandler(maxMegabytes: number): ErrorRequestHandler {
  return async (error, req, _res, next) => {
    // Multer removes the files it finished; a file cut off mid-stream is removed here.
    ;(req as TrackedRequest)[ABANDONED] = true
    await Promise.all(
      ((req as TrackedRequest)[TEMP_PATHS] ?? []).map((path) => rm(path, { force: true })),
    )
    if (!(error instanceof multer.MulterError)) {
      // Multer marks every error it aborted an upload with (busboy's "Unexpected end of form",
      // a malformed part header): the client sent a broken body, not a server fault.
      const fromMultipart = typeof error === 'object' && error !== null && 'storageErrors' in error
      next(
        fromMultipart
          ? new HttpError(
              400,
              'upload_refused',
              `The upload could not be read: ${(error as Error).message}.`,
            )
          : error,
      )
      return
    }
    const messages: Record<string, [number, string]> = {
      LIMIT_FILE_SIZE: [413, `A file is larger than the ${maxMegabytes} MB limit.`],
      LIMIT_FILE_COUNT: [400, 'At most 20 files can be uploaded at once.'],
      LIMIT_UNEXPECTED_FILE: [
        400,
        `Files must be sent in the multipart field "file" (got "${error.field ?? ''}").`,
      ],
      LIMIT_FIELD_COUNT: [400, 'Too many form fields.'],
    }
    const [status, message] = messages[error.code] ?? [400, `Upload refused: ${error.message}`]
    next(new HttpError(status, status === 413 ? 'too_large' : 'upload_refused', message))
  }
}

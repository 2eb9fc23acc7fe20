import type { ErrorRequestHandler } from 'express'
import { ZodError } from 'zod'
import { HttpError } from '../errors'
import { zodDetails } from '../schemas/zod-details'
import { isDatabaseUnreachable, isLockContention } from '../db/unavailable'

/** Seconds a client is asked to wait before trying again after a 503. */
export const RETRY_AFTER_SECONDS = 5

interface MysqlError {
  code?: string
  sqlMessage?: string
}

function isDuplicateEntry(error: unknown): error is MysqlError {
  return (
    typeof error === 'object' && error !== null && (error as MysqlError).code === 'ER_DUP_ENTRY'
  )
}

/** A write that a foreign key refused, e.g. a row deleted while another was created against it. */
function isForeignKeyRefusal(error: unknown): boolean {
  const code = typeof error === 'object' && error !== null ? (error as MysqlError).code : undefined
  return code === 'ER_ROW_IS_REFERENCED_2' || code === 'ER_NO_REFERENCED_ROW_2'
}

interface BodyParserError {
  type?: string
  status?: number
  expose?: boolean
  charset?: string
  encoding?: string
}

/**
 * body-parser's refusals (http-errors with a 4xx status and `expose`) in our own words: a body
 * that could not be read is the client's mistake, never a 500.
 */
function bodyParserRefusal(error: unknown): HttpError | null {
  if (typeof error !== 'object' || error === null) return null
  const parserError = error as BodyParserError
  const status = parserError.status
  if (parserError.expose !== true || typeof status !== 'number' || status < 400 || status >= 500)
    return null
  switch (parserError.type) {
    case 'entity.parse.failed':
      return new HttpError(400, 'malformed_json', 'The request body is not valid JSON.')
    case 'entity.too.large':
      return new HttpError(413, 'too_large', 'The request body is too large.')
    // RFC 8259 §8.1: JSON between systems is UTF-8.
    case 'charset.unsupported':
      return new HttpError(
        415,
        'unsupported_charset',
        `Send JSON as UTF-8 (Content-Type: application/json; charset=utf-8), not ${String(parserError.charset ?? 'another charset').toUpperCase()}.`,
      )
    // RFC 9110 §8.4.1: a content coding the server does not know is a 415.
    case 'encoding.unsupported':
      return new HttpError(
        415,
        'unsupported_encoding',
        `The Content-Encoding "${parserError.encoding ?? ''}" is not accepted: send the body uncompressed, or as gzip, deflate or br.`,
      )
    // Thrown by refuseInvalidUtf8 (body-parser reports a failed verify as 403; it is a 400).
    case 'entity.verify.failed':
      return new HttpError(
        400,
        'invalid_utf8',
        'The request body is not valid UTF-8 text; send JSON encoded as UTF-8.',
      )
    default:
      return new HttpError(
        400,
        'unreadable_body',
        'The request body could not be read: it was cut short, or its Content-Encoding does not match its bytes.',
      )
  }
}

/**
 * The router's refusal of a path parameter whose %-escapes are not UTF-8 (it throws a URIError
 * with status 400 from decodeURIComponent): the client's mistake, never a 500.
 */
function isUndecodablePath(error: unknown): boolean {
  return error instanceof URIError && (error as { status?: number }).status === 400
}

/** Maps every failure to `{ error: { code, message, details? } }`; logs what was unexpected. */
export function errorHandler(exposeInternals: boolean): ErrorRequestHandler {
  return (error, req, res, _next) => {
    if (error instanceof HttpError) {
      res
        .status(error.status)
        .json({ error: { code: error.code, message: error.message, details: error.details } })
      return
    }
    if (error instanceof ZodError) {
      const details = zodDetails(error)
      res.status(400).json({
        error: {
          code: 'validation_failed',
          message: Object.values(details).flat()[0] ?? 'Invalid input.',
          details,
        },
      })
      return
    }
    if (isForeignKeyRefusal(error)) {
      res.status(409).json({
        error: {
          code: 'conflict',
          message: 'Other records still refer to this one, or the one it refers to is gone.',
        },
      })
      return
    }
    if (isDuplicateEntry(error)) {
      res.status(409).json({
        error: {
          code: 'conflict',
          message: 'A record with the same unique value already exists.',
        },
      })
      return
    }
    if (isDatabaseUnreachable(error)) {
      req.log?.warn({ code: (error as { code?: string }).code }, 'database unreachable')
      res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS))
      res.status(503).json({
        error: {
          code: 'database_unavailable',
          message: `The database is not answering right now. Try again in ${RETRY_AFTER_SECONDS} seconds; if this goes on, tell your administrator.`,
        },
      })
      return
    }
    if (isLockContention(error)) {
      res.setHeader('Retry-After', '1')
      res.status(503).json({
        error: {
          code: 'busy',
          message: 'Someone else was changing the same records at that moment. Try again.',
        },
      })
      return
    }
    if (isUndecodablePath(error)) {
      res.status(400).json({
        error: {
          code: 'bad_path',
          message: 'The address has a %-escape that is not UTF-8 text.',
        },
      })
      return
    }
    const refusal = bodyParserRefusal(error)
    if (refusal) {
      res.status(refusal.status).json({ error: { code: refusal.code, message: refusal.message } })
      return
    }
    req.log?.error({ err: error }, 'unhandled error')
    const message =
      exposeInternals && error instanceof Error
        ? error.message
        : 'Something went wrong on the server.'
    res.status(500).json({ error: { code: 'internal', message } })
  }
}

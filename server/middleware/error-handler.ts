import type { ErrorRequestHandler } from 'express'
import { ZodError } from 'zod'
import { HttpError } from '../errors'
import { zodDetails } from '../schemas/zod-details'

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
    const parserError = error as BodyParserError
    if (parserError.type === 'entity.parse.failed') {
      res
        .status(400)
        .json({ error: { code: 'malformed_json', message: 'The request body is not valid JSON.' } })
      return
    }
    if (parserError.type === 'entity.too.large') {
      res
        .status(413)
        .json({ error: { code: 'too_large', message: 'The request body is too large.' } })
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

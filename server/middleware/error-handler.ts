import type { ErrorRequestHandler } from 'express'
import { ZodError } from 'zod'
import { HttpError } from '../errors'
import { zodDetails } from '../schemas/zod-details'

interface MysqlError {
  code?: string
  sqlMessage?: string
}

function isDuplicateEntry(error: unknown): error is MysqlError {
  return typeof error === 'object' && error !== null && (error as MysqlError).code === 'ER_DUP_ENTRY'
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
      res.status(error.status).json({ error: { code: error.code, message: error.message, details: error.details } })
      return
    }
    if (error instanceof ZodError) {
      const details = zodDetails(error)
      res.status(400).json({ error: { code: 'validation_failed', message: Object.values(details).flat()[0] ?? 'Invalid input.', details } })
      return
    }
    if (isDuplicateEntry(error)) {
      res.status(409).json({ error: { code: 'conflict', message: 'A record with the same unique value already exists.' } })
      return
    }
    const parserError = error as BodyParserError
    if (parserError.type === 'entity.parse.failed') {
      res.status(400).json({ error: { code: 'malformed_json', message: 'The request body is not valid JSON.' } })
      return
    }
    if (parserError.type === 'entity.too.large') {
      res.status(413).json({ error: { code: 'too_large', message: 'The request body is too large.' } })
      return
    }
    req.log?.error({ err: error }, 'unhandled error')
    const message = exposeInternals && error instanceof Error ? error.message : 'Something went wrong on the server.'
    res.status(500).json({ error: { code: 'internal', message } })
  }
}

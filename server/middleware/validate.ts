import type { RequestHandler } from 'express'
import type { ZodType } from 'zod'
import { badRequest } from '../errors'
import { zodDetails } from '../schemas/zod-details'
import { tagHandler } from './handler-tags'

type Part = 'body' | 'query' | 'params'

/**
 * Parses one part of the request with a zod schema. The parsed value is stored on
 * `res.locals[part]` (Express 5 makes req.query read-only) and, for the body, on req.body too.
 */
export function validate(part: Part, schema: ZodType): RequestHandler {
  const handler: RequestHandler = (req, res, next) => {
    const result = schema.safeParse(req[part] ?? {})
    if (!result.success) {
      const details = zodDetails(result.error)
      throw badRequest(Object.values(details).flat()[0] ?? 'Invalid input.', details)
    }
    res.locals[part] = result.data
    if (part === 'body') req.body = result.data
    next()
  }
  return tagHandler(handler, { validates: { part, schema } })
}

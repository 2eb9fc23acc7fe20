import type { RequestHandler } from 'express'
import type { ZodType } from 'zod'
import type { Permission } from '../../shared/types/permissions'

/**
 * What a middleware checks, readable from the app's router stack: the bad-input suite walks the
 * stack to learn, for every route, which roles may call it and which schema reads each part of
 * the request, so that a route added later is covered without being listed by hand.
 */
export interface HandlerTag {
  /** The request needs a signed-in session. */
  session?: true
  /** The signed-in role needs this permission. */
  permission?: Permission
  /** This part of the request is parsed with this schema. */
  validates?: { part: 'body' | 'query' | 'params'; schema: ZodType }
}

const tags = new WeakMap<RequestHandler, HandlerTag>()

export function tagHandler<Handler extends RequestHandler>(
  handler: Handler,
  tag: HandlerTag,
): Handler {
  tags.set(handler, tag)
  return handler
}

export function tagOf(handler: unknown): HandlerTag | undefined {
  return typeof handler === 'function' ? tags.get(handler as RequestHandler) : undefined
}

import type { RequestHandler } from 'express'

/**
 * Every API answer carries patient data or account state, so no browser or proxy may keep a copy
 * (a shared workstation's disk cache would otherwise hold identified films and lists after
 * sign-out). Routes may still send an ETag; a client revalidates rather than reads a stored copy.
 */
export const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('Cache-Control', 'no-store')
  next()
}

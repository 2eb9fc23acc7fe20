import type { RequestHandler } from 'express'
import { forbidden } from '../errors'

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS'])

/**
 * Second line against cross-site request forgery beside the SameSite=Strict cookie: browsers
 * label every request with Sec-Fetch-Site, and a state-changing one from another site is refused.
 */
export const sameOriginWrites: RequestHandler = (req, _res, next) => {
  if (!SAFE_METHODS.has(req.method) && req.get('sec-fetch-site') === 'cross-site') {
    throw forbidden('Cross-site requests are not accepted.')
  }
  next()
}

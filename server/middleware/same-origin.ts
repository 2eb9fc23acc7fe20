import type { RequestHandler } from 'express'
import { forbidden } from '../errors'

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS'])

/** Sec-Fetch-Site values a state-changing request may carry: our own pages, or typed by hand. */
const ALLOWED_FETCH_SITES = new Set(['same-origin', 'none'])

/**
 * Second line against cross-site request forgery beside the SameSite=Strict cookie: browsers
 * label every request with Sec-Fetch-Site, and a state-changing one from any other origin
 * (another site, or a sibling subdomain: "same-site") is refused. Clients that send no such
 * header (scripts, tests) are not browsers and carry no ambient cookie by accident.
 */
export const sameOriginWrites: RequestHandler = (req, _res, next) => {
  const site = req.get('sec-fetch-site')
  if (!SAFE_METHODS.has(req.method) && site !== undefined && !ALLOWED_FETCH_SITES.has(site)) {
    throw forbidden('Cross-site requests are not accepted.')
  }
  next()
}

import type { Request, RequestHandler } from 'express'
import { forbidden } from '../errors'

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS'])

/** Sec-Fetch-Site values a state-changing request may carry: our own pages, or typed by hand. */
const ALLOWED_FETCH_SITES = new Set(['same-origin', 'none'])

export const NO_ORIGIN_MESSAGE =
  'Changes are accepted from Endplate’s own pages only: this request named neither its site (Sec-Fetch-Site) nor its origin (Origin).'

/** The origin a write must come from: PUBLIC_URL's, or this request's own scheme and host. */
function ownOrigin(req: Request, publicOrigin: string | null): string {
  return publicOrigin ?? `${req.protocol}://${req.get('host') ?? ''}`
}

/**
 * Second line against cross-site request forgery beside the SameSite=Strict cookie. Browsers
 * label requests with Sec-Fetch-Site; a state-changing one from any other origin (another site,
 * or a sibling subdomain: "same-site") is refused. An older browser or a proxy that drops that
 * header still sends Origin on writes, which must then equal the site's own origin exactly. A
 * write with neither cannot be told from a forged one and is refused; scripts set one of them.
 */
export function sameOriginWrites(publicUrl: string): RequestHandler {
  const publicOrigin = publicUrl ? new URL(publicUrl).origin : null
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next()
    const site = req.get('sec-fetch-site')
    if (site !== undefined) {
      if (!ALLOWED_FETCH_SITES.has(site)) throw forbidden('Cross-site requests are not accepted.')
      return next()
    }
    const origin = req.get('origin')
    if (origin === undefined) throw forbidden(NO_ORIGIN_MESSAGE)
    if (origin !== ownOrigin(req, publicOrigin))
      throw forbidden(`Cross-site requests are not accepted (from ${origin.slice(0, 200)}).`)
    next()
  }
}

import express, { type Express } from 'express'

/**
 * Browsers label every request with Sec-Fetch-Site; supertest does not. Test requests that name
 * neither their site nor their origin are marked as coming from the app's own pages, so API
 * tests exercise the routes; a test that sets either header (the cross-site checks) is left as
 * it is, and the tests of the check itself use the bare app.
 */
export function asSameOriginClient(app: Express): Express {
  const outer = express()
  outer.disable('x-powered-by')
  outer.use((req, _res, next) => {
    if (req.headers['sec-fetch-site'] === undefined && req.headers.origin === undefined)
      req.headers['sec-fetch-site'] = 'same-origin'
    next()
  })
  outer.use(app)
  return outer
}

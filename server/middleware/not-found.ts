import type { RequestHandler } from 'express'

export const notFoundHandler: RequestHandler = (req, res) => {
  res
    .status(404)
    .json({ error: { code: 'not_found', message: `No API route ${req.method} ${req.path}.` } })
}

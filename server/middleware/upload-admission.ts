import type { RequestHandler } from 'express'
import { HttpError } from '../errors'

/** Seconds a refused uploader is asked to wait: about the time a queue of films takes to drain. */
export const UPLOAD_RETRY_AFTER_SECONDS = 15

/**
 * Bounds the uploads in flight (streaming, queued for decoding, decoding or being filed) to
 * `limit`. A request over it is answered 503 with Retry-After before any byte is read, so a
 * burst of uploads queues on disk at most `limit` deep and never exhausts memory or the cores.
 */
export function uploadAdmission(limit: number): RequestHandler {
  let inFlight = 0
  return (_req, res, next) => {
    if (inFlight >= limit) {
      res.setHeader('Retry-After', String(UPLOAD_RETRY_AFTER_SECONDS))
      throw new HttpError(
        503,
        'busy',
        `Endplate is filing many films right now, so this upload was not taken. Try again in ${UPLOAD_RETRY_AFTER_SECONDS} seconds.`,
      )
    }
    inFlight += 1
    // 'close' fires once whether the answer was sent or the client went away.
    res.once('close', () => {
      inFlight -= 1
    })
    next()
  }
}

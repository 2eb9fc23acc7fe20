import { pipeline } from 'node:stream/promises'
import { Router } from 'express'
import type { Db } from '../db/knex'
import type { FileStore } from '../storage/file-store'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import { calibrationBody, pixelReviewBody, renditionParams } from '../schemas/images'
import {
  calibrateImage,
  getImage,
  openRendition,
  removeImage,
  reviewFilmPixels,
} from '../services/images'
import { actorOf } from './actor'

export function imagesRouter(db: Db, store: FileStore): Router {
  const router = Router()

  router.get(
    '/:id',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getImage(db, actorOf(req), res.locals.params.id))
    },
  )

  router.delete(
    '/:id',
    requirePermission('image:upload'),
    validate('params', idParam),
    async (req, res) => {
      await removeImage(db, store, actorOf(req), res.locals.params.id)
      res.status(204).end()
    },
  )

  router.patch(
    '/:id/calibration',
    requirePermission('image:upload'),
    validate('params', idParam),
    validate('body', calibrationBody),
    async (req, res) => {
      res.json(await calibrateImage(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.put(
    '/:id/pixel-review',
    requirePermission('image:review-pixels'),
    validate('params', idParam),
    validate('body', pixelReviewBody),
    async (req, res) => {
      res.json(await reviewFilmPixels(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  // Renditions of identified films are never stored by the browser (the API's no-store stays);
  // the ETag (one per film and rendition) still lets a client revalidate with If-None-Match.
  router.get(
    '/:id/files/:name',
    requirePermission('patient:read'),
    validate('params', renditionParams),
    async (req, res) => {
      const { stream, mediaType, etag } = await openRendition(
        db,
        store,
        actorOf(req),
        res.locals.params.id,
        res.locals.params.name,
      )
      if (req.get('if-none-match') === etag) {
        stream.destroy()
        res.status(304).end()
        return
      }
      res.setHeader('Content-Type', mediaType)
      res.setHeader('ETag', etag)
      // pipeline destroys the file stream when the browser cancels the download.
      await pipeline(stream, res).catch((error: NodeJS.ErrnoException) => {
        if (error.code !== 'ERR_STREAM_PREMATURE_CLOSE') throw error
      })
    },
  )

  return router
}

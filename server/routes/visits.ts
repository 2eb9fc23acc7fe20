import { rm } from 'node:fs/promises'
import { Router } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import { patchVisitBody } from '../schemas/visits'
import { getVisit, loadVisibleVisit, patchVisit } from '../services/visits'
import { actorOf } from './actor'
import type { FileStore } from '../storage/file-store'
import { filmUpload, uploadErrorHandler, uploadsOf } from '../middleware/upload'
import { uploadAdmission } from '../middleware/upload-admission'
import { uploadFields } from '../schemas/images'
import { listVisitImages, uploadImages } from '../services/images'

export interface VisitsRouterOptions {
  store: FileStore
  uploadTmpDir: string
  uploadMaxMb: number
  /** All files of one upload request together, in megabytes. */
  uploadRequestMaxMb: number
  /** Uploads in flight at once; more are answered 503 with Retry-After. */
  uploadQueueLimit: number
}

export function visitsRouter(db: Db, options: VisitsRouterOptions): Router {
  const router = Router()
  const uploadLimits = {
    fileMaxMb: options.uploadMaxMb,
    requestMaxMb: options.uploadRequestMaxMb,
  }

  router.get(
    '/:id',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getVisit(db, actorOf(req), res.locals.params.id))
    },
  )

  router.patch(
    '/:id',
    requirePermission('visit:write'),
    validate('params', idParam),
    validate('body', patchVisitBody),
    async (req, res) => {
      res.json(await patchVisit(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.get(
    '/:id/images',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await listVisitImages(db, actorOf(req), res.locals.params.id))
    },
  )

  // Permission, id, room in the upload queue and the visit itself are checked before multer
  // streams anything to disk.
  router.post(
    '/:id/images',
    requirePermission('image:upload'),
    validate('params', idParam),
    uploadAdmission(options.uploadQueueLimit),
    async (req, res, next) => {
      await loadVisibleVisit(db, actorOf(req), res.locals.params.id)
      next()
    },
    filmUpload(options.uploadTmpDir, uploadLimits),
    async (req, res) => {
      const files = uploadsOf(req.files)
      const parsed = uploadFields.safeParse(req.body ?? {})
      if (!parsed.success) {
        await Promise.all(files.map((file) => rm(file.path, { force: true })))
        throw parsed.error
      }
      const records = await uploadImages(db, options.store, actorOf(req), res.locals.params.id, {
        files,
        views: parsed.data.view,
        confirmPatientMismatch: parsed.data.confirmPatientMismatch,
        workDir: options.uploadTmpDir,
      })
      res.status(201).json(records)
    },
  )

  router.use(uploadErrorHandler(uploadLimits))
  return router
}

import { Router } from 'express'
import type { Db } from '../db/knex'
import type { FileStore } from '../storage/file-store'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import { deidentifiedDicom } from '../services/image-dicom'
import { actorOf } from './actor'

/** `GET /api/images/:id/dicom`: the film's DICOM, de-identified for research. */
export function imageDicomRouter(db: Db, store: FileStore, uidSecret: string): Router {
  const router = Router()
  router.get(
    '/:id/dicom',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      const { bytes, fileName } = await deidentifiedDicom(
        db,
        store,
        actorOf(req),
        res.locals.params.id,
        uidSecret,
      )
      res.setHeader('Content-Type', 'application/dicom')
      res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`)
      res.setHeader('Cache-Control', 'private, no-store')
      res.send(bytes)
    },
  )
  return router
}

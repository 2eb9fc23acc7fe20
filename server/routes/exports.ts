import { Router, type Response } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { measurementExportQuery } from '../schemas/exports'
import {
  dataDictionaryFor,
  countMeasurementExport,
  prepareMeasurementExport,
  writeMeasurementExport,
  type ExportFormat,
} from '../services/exports'
import { writeCsv } from '../exports/write-table'
import { exportWorkersFree, warmExportWorkers } from '../exports/export-row-pool'
import { HttpError } from '../errors'
import { actorOf } from './actor'

const MEDIA_TYPES: Record<ExportFormat, string> = {
  csv: 'text/csv; charset=utf-8',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
}

/** Seconds a refused export is asked to wait: about what a large export takes to download. */
const EXPORT_RETRY_AFTER_SECONDS = 30

function startDownload(res: Response, format: ExportFormat, fileName: string): void {
  res.setHeader('Content-Type', MEDIA_TYPES[format])
  res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`)
  // Patient data: no shared cache may keep it.
  res.setHeader('Cache-Control', 'private, no-store')
}

export function exportsRouter(db: Db): Router {
  const router = Router()

  router.get(
    '/measurements/count',
    requirePermission('export:measurements'),
    validate('query', measurementExportQuery),
    async (req, res) => {
      const prepared = await prepareMeasurementExport(db, actorOf(req), res.locals.query)
      // The export panel asks the size before any download: the workers start loading meanwhile.
      void warmExportWorkers()
      res.json(await countMeasurementExport(db, prepared))
    },
  )

  for (const format of ['csv', 'xlsx'] as const) {
    router.get(
      `/measurements.${format}`,
      requirePermission('export:measurements'),
      validate('query', measurementExportQuery),
      async (req, res) => {
        const actor = actorOf(req)
        // Every check happens before the first byte, so refusals still answer a JSON error.
        const prepared = await prepareMeasurementExport(db, actor, res.locals.query)
        if (!exportWorkersFree(format)) {
          res.setHeader('Retry-After', String(EXPORT_RETRY_AFTER_SECONDS))
          throw new HttpError(
            503,
            'busy',
            `Other exports are downloading right now. Try again in ${EXPORT_RETRY_AFTER_SECONDS} seconds.`,
          )
        }
        startDownload(res, format, `${prepared.fileStem}.${format}`)
        await writeMeasurementExport(db, actor, prepared, format, res).catch((error) => {
          // Headers are gone; cut the connection so the client sees an incomplete download.
          req.log.error({ err: error }, 'measurement export stopped')
          res.destroy()
        })
      },
    )
  }

  router.get(
    '/data-dictionary.csv',
    requirePermission('export:measurements'),
    validate('query', measurementExportQuery),
    async (req, res) => {
      const sheet = dataDictionaryFor(actorOf(req), res.locals.query.identified === true)
      startDownload(res, 'csv', 'endplate-data-dictionary.csv')
      await writeCsv(sheet, res)
    },
  )

  return router
}

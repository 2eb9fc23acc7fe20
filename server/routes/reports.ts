import { Router, type Response } from 'express'
import type { Db } from '../db/knex'
import type { FileStore } from '../storage/file-store'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import {
  getReadingReport,
  getVisitReport,
  readingReportPdf,
  visitReportPdf,
} from '../services/reports'
import { actorOf } from './actor'

function sendPdf(res: Response, pdf: Buffer, name: string): void {
  res.setHeader('Content-Type', 'application/pdf')
  res.setHeader('Content-Disposition', `inline; filename="${name}"`)
  // A report carries patient data: no cache may keep it.
  res.setHeader('Cache-Control', 'no-store')
  res.send(pdf)
}

/**
 * Mounted at /api: a reading's and a visit's report, as PDF and as content for the printable
 * page. Reads only.
 */
export function reportsRouter(db: Db, store: FileStore): Router {
  const router = Router()
  const read = [requirePermission('patient:read'), validate('params', idParam)]

  router.get('/readings/:id/report.pdf', ...read, async (req, res) => {
    const id = res.locals.params.id as number
    sendPdf(res, await readingReportPdf(db, store, actorOf(req), id), `endplate-reading-${id}.pdf`)
  })
  router.get('/readings/:id/report', ...read, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store')
    res.json(await getReadingReport(db, actorOf(req), res.locals.params.id))
  })
  router.get('/visits/:id/report.pdf', ...read, async (req, res) => {
    const id = res.locals.params.id as number
    sendPdf(res, await visitReportPdf(db, store, actorOf(req), id), `endplate-visit-${id}.pdf`)
  })
  router.get('/visits/:id/report', ...read, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store')
    res.json(await getVisitReport(db, actorOf(req), res.locals.params.id))
  })
  return router
}

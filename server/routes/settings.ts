import { Router, type ErrorRequestHandler } from 'express'
import type { Db } from '../db/knex'
import { requirePermission } from '../middleware/require-permission'
import { validate } from '../middleware/validate'
import { siteSettingsUpdateBody } from '../schemas/site-settings'
import {
  getSiteSettings,
  SettingsConflictError,
  updateSiteSettings,
} from '../services/site-settings'
import { actorOf } from './actor'

/** A stale save answers the usual error body plus the settings as they now stand. */
const conflictWithCurrent: ErrorRequestHandler = (error, _req, res, next) => {
  if (!(error instanceof SettingsConflictError)) return next(error)
  res.status(409).json({
    error: { code: error.code, message: error.message, details: error.details },
    current: error.current,
  })
}

/** Everyone signed in reads the settings (the live results use them); administrators change them. */
export function settingsRouter(db: Db): Router {
  const router = Router()
  router.get('/', async (_req, res) => {
    res.json(await getSiteSettings(db))
  })
  router.put(
    '/',
    requirePermission('settings:write'),
    validate('body', siteSettingsUpdateBody),
    async (req, res) => {
      res.json(await updateSiteSettings(db, actorOf(req), req.body))
    },
  )
  router.use(conflictWithCurrent)
  return router
}

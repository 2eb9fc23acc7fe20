import { Router, type ErrorRequestHandler } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import {
  amendmentBody,
  commentBody,
  createReadingBody,
  patchReadingBody,
  readingQuery,
  returnReadingBody,
  submitReadingBody,
} from '../schemas/readings'
import {
  createReading,
  getReading,
  listImageReadings,
  patchReading,
  ReadingConflictError,
  submitReading,
} from '../services/readings'
import { amendReading, returnReading, signReading } from '../services/reading-review'
import { addReadingComment, listReadingComments } from '../services/reading-comments'
import { listReadings } from '../services/reading-worklist'
import { toBlindedDto } from '../services/blinded-readings'
import type { Reading } from '../../shared/types/readings'
import type { Actor } from '../services/audit'
import { actorOf } from './actor'

/** The answer to the rater's own write: a round's reading as the round lets its rater see it. */
const asRaterSees = (db: Db, actor: Actor, reading: Reading) =>
  reading.blinded ? toBlindedDto(db, actor, reading, true) : reading

/** A version conflict answers the usual error body plus the reading as it now stands. */
const conflictWithCurrent: ErrorRequestHandler = (error, _req, res, next) => {
  if (!(error instanceof ReadingConflictError)) return next(error)
  res.status(409).json({
    error: { code: error.code, message: error.message, details: error.details },
    current: error.current,
  })
}

/** Mounted at /api: readings live under /readings, and a film's readings under /images/:id. */
export function readingsRouter(db: Db): Router {
  const router = Router()

  router.post(
    '/images/:id/readings',
    requirePermission('reading:write'),
    validate('params', idParam),
    validate('body', createReadingBody),
    async (req, res) => {
      res.status(201).json(await createReading(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.get(
    '/images/:id/readings',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await listImageReadings(db, actorOf(req), res.locals.params.id))
    },
  )

  router.get(
    '/readings',
    requirePermission('patient:read'),
    validate('query', readingQuery),
    async (req, res) => {
      res.json(await listReadings(db, actorOf(req), res.locals.query))
    },
  )

  router.get(
    '/readings/:id',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getReading(db, actorOf(req), res.locals.params.id))
    },
  )

  router.patch(
    '/readings/:id',
    requirePermission('reading:write'),
    validate('params', idParam),
    validate('body', patchReadingBody),
    async (req, res) => {
      const actor = actorOf(req)
      res.json(
        await asRaterSees(db, actor, await patchReading(db, actor, res.locals.params.id, req.body)),
      )
    },
  )

  router.post(
    '/readings/:id/submit',
    requirePermission('reading:write'),
    validate('params', idParam),
    validate('body', submitReadingBody),
    async (req, res) => {
      const actor = actorOf(req)
      const submitted = await submitReading(db, actor, res.locals.params.id, req.body.version)
      res.json(await asRaterSees(db, actor, submitted))
    },
  )

  router.post(
    '/readings/:id/sign',
    requirePermission('reading:sign'),
    validate('params', idParam),
    validate('body', submitReadingBody),
    async (req, res) => {
      res.json(await signReading(db, actorOf(req), res.locals.params.id, req.body.version))
    },
  )

  router.post(
    '/readings/:id/return',
    requirePermission('reading:sign'),
    validate('params', idParam),
    validate('body', returnReadingBody),
    async (req, res) => {
      res.json(await returnReading(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.post(
    '/readings/:id/amendments',
    requirePermission('reading:write'),
    validate('params', idParam),
    validate('body', amendmentBody),
    async (req, res) => {
      res
        .status(201)
        .json(await amendReading(db, actorOf(req), res.locals.params.id, req.body.reason))
    },
  )

  router.get(
    '/readings/:id/comments',
    requirePermission('reading:comment'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await listReadingComments(db, actorOf(req), res.locals.params.id))
    },
  )

  router.post(
    '/readings/:id/comments',
    requirePermission('reading:comment'),
    validate('params', idParam),
    validate('body', commentBody),
    async (req, res) => {
      res
        .status(201)
        .json(await addReadingComment(db, actorOf(req), res.locals.params.id, req.body.text))
    },
  )

  router.use(conflictWithCurrent)
  return router
}

import { pipeline } from 'node:stream/promises'
import { Router } from 'express'
import type { Db } from '../db/knex'
import type { Clock } from '../clock'
import type { FileStore } from '../storage/file-store'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import {
  assignmentQuery,
  createRoundBody,
  filmRenditionParams,
  patchRoundBody,
  roundListQuery,
} from '../schemas/rounds'
import {
  createRound,
  getRound,
  listRoundFilmCandidates,
  listRounds,
  patchRound,
} from '../services/rounds'
import {
  assignmentFilm,
  listAssignments,
  openAssignmentRendition,
  startAssignment,
} from '../services/assignments'
import { getRoundResults } from '../services/round-results'
import { exportRoundResultsCsv } from '../services/round-results-csv'
import { actorOf } from './actor'

/** Mounted at /api: a study's rounds, one round, and the rater's assignments. */
export function roundsRouter(db: Db, deps: { store: FileStore; now: Clock }): Router {
  const router = Router()
  const { store, now } = deps

  router.post(
    '/studies/:id/rounds',
    requirePermission('round:manage'),
    validate('params', idParam),
    validate('body', createRoundBody),
    async (req, res) => {
      res.status(201).json(await createRound(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.get(
    '/studies/:id/round-film-candidates',
    requirePermission('round:manage'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await listRoundFilmCandidates(db, actorOf(req), res.locals.params.id))
    },
  )

  router.get(
    '/studies/:id/rounds',
    requirePermission('round:read'),
    validate('params', idParam),
    validate('query', roundListQuery),
    async (req, res) => {
      res.json(await listRounds(db, actorOf(req), res.locals.params.id, res.locals.query))
    },
  )

  router.get(
    '/rounds/:id',
    requirePermission('round:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getRound(db, actorOf(req), res.locals.params.id, now()))
    },
  )

  router.patch(
    '/rounds/:id',
    requirePermission('round:manage'),
    validate('params', idParam),
    validate('body', patchRoundBody),
    async (req, res) => {
      res.json(await patchRound(db, actorOf(req), res.locals.params.id, req.body, now()))
    },
  )

  router.get(
    '/rounds/:id/results',
    requirePermission('round:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getRoundResults(db, actorOf(req), res.locals.params.id, now()))
    },
  )

  router.get(
    '/rounds/:id/results.csv',
    requirePermission('round:read'),
    validate('params', idParam),
    async (req, res) => {
      const id = res.locals.params.id as number
      const csv = await exportRoundResultsCsv(db, actorOf(req), id, now())
      res.setHeader('Content-Type', 'text/csv; charset=utf-8')
      res.setHeader('Content-Disposition', `attachment; filename="round-${id}-results.csv"`)
      res.send(csv)
    },
  )

  router.get(
    '/assignments',
    requirePermission('round:rate'),
    validate('query', assignmentQuery),
    async (req, res) => {
      res.json(await listAssignments(db, actorOf(req), res.locals.query, now()))
    },
  )

  router.post(
    '/assignments/:id/start',
    requirePermission('round:rate'),
    validate('params', idParam),
    async (req, res) => {
      const started = await startAssignment(db, actorOf(req), res.locals.params.id, now())
      res.status(started.created ? 201 : 200).json({ readingId: started.readingId })
    },
  )

  router.get(
    '/assignments/:id/film.json',
    requirePermission('round:rate'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await assignmentFilm(db, actorOf(req), res.locals.params.id, now()))
    },
  )

  router.get(
    '/assignments/:id/film/:name',
    requirePermission('round:rate'),
    validate('params', filmRenditionParams),
    async (req, res) => {
      const { stream, mediaType, etag } = await openAssignmentRendition(
        db,
        store,
        actorOf(req),
        res.locals.params.id,
        res.locals.params.name,
        now(),
      )
      if (req.get('if-none-match') === etag) {
        stream.destroy()
        res.status(304).end()
        return
      }
      res.setHeader('Content-Type', mediaType)
      // Private and short: the rater's access ends with the round.
      res.setHeader('Cache-Control', 'private, no-cache')
      res.setHeader('ETag', etag)
      await pipeline(stream, res).catch((error: NodeJS.ErrnoException) => {
        if (error.code !== 'ERR_STREAM_PREMATURE_CLOSE') throw error
      })
    },
  )

  return router
}

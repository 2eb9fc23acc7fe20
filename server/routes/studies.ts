import { Router } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import {
  createStudyBody,
  patchStudyBody,
  studyMembersBody,
  studyPatientQuery,
  studyPatientsBody,
  studyQuery,
} from '../schemas/studies'
import {
  createStudy,
  getStudy,
  listMemberCandidates,
  listPatientCandidates,
  listStudies,
  listStudyPatients,
  patchStudy,
  setStudyMembers,
  setStudyPatients,
} from '../services/studies'
import { actorOf } from './actor'

export function studiesRouter(db: Db): Router {
  const router = Router()

  router.get(
    '/',
    requirePermission('study:read'),
    validate('query', studyQuery),
    async (req, res) => {
      res.json(await listStudies(db, actorOf(req), res.locals.query))
    },
  )

  router.post(
    '/',
    requirePermission('study:manage'),
    validate('body', createStudyBody),
    async (req, res) => {
      res.status(201).json(await createStudy(db, actorOf(req), req.body))
    },
  )

  // Before '/:id' so that the literal paths are not taken for ids.
  router.get(
    '/patient-candidates',
    requirePermission('study:manage'),
    validate('query', studyPatientQuery),
    async (req, res) => {
      res.json(await listPatientCandidates(db, actorOf(req), res.locals.query))
    },
  )

  router.get('/member-candidates', requirePermission('study:manage'), async (_req, res) => {
    res.json(await listMemberCandidates(db))
  })

  router.get(
    '/:id',
    requirePermission('study:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getStudy(db, actorOf(req), res.locals.params.id))
    },
  )

  router.patch(
    '/:id',
    requirePermission('study:manage'),
    validate('params', idParam),
    validate('body', patchStudyBody),
    async (req, res) => {
      res.json(await patchStudy(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.get(
    '/:id/patients',
    requirePermission('study:read'),
    validate('params', idParam),
    validate('query', studyPatientQuery),
    async (req, res) => {
      res.json(await listStudyPatients(db, actorOf(req), res.locals.params.id, res.locals.query))
    },
  )

  router.put(
    '/:id/patients',
    requirePermission('study:manage'),
    validate('params', idParam),
    validate('body', studyPatientsBody),
    async (req, res) => {
      res.json(await setStudyPatients(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.get(
    '/:id/members',
    requirePermission('study:read'),
    validate('params', idParam),
    async (req, res) => {
      const { members } = await getStudy(db, actorOf(req), res.locals.params.id)
      res.json({ items: members, total: members.length })
    },
  )

  router.put(
    '/:id/members',
    requirePermission('study:manage'),
    validate('params', idParam),
    validate('body', studyMembersBody),
    async (req, res) => {
      res.json(await setStudyMembers(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  return router
}

import { Router } from 'express'
import type { Db } from '../db/knex'
import { validate } from '../middleware/validate'
import { requirePermission } from '../middleware/require-permission'
import { idParam } from '../schemas/common'
import { createPatientBody, patchPatientBody, patientQuery } from '../schemas/patients'
import { createVisitBody } from '../schemas/visits'
import { createPatient, getPatient, listPatients, patchPatient } from '../services/patients'
import { createVisit, listVisits } from '../services/visits'
import { actorOf } from './actor'

export function patientsRouter(db: Db): Router {
  const router = Router()

  router.get(
    '/',
    requirePermission('patient:read'),
    validate('query', patientQuery),
    async (req, res) => {
      res.json(await listPatients(db, actorOf(req), res.locals.query))
    },
  )

  router.post(
    '/',
    requirePermission('patient:write'),
    validate('body', createPatientBody),
    async (req, res) => {
      res.status(201).json(await createPatient(db, actorOf(req), req.body))
    },
  )

  router.get(
    '/:id',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await getPatient(db, actorOf(req), res.locals.params.id))
    },
  )

  router.patch(
    '/:id',
    requirePermission('patient:write'),
    validate('params', idParam),
    validate('body', patchPatientBody),
    async (req, res) => {
      res.json(await patchPatient(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  router.get(
    '/:id/visits',
    requirePermission('patient:read'),
    validate('params', idParam),
    async (req, res) => {
      res.json(await listVisits(db, actorOf(req), res.locals.params.id))
    },
  )

  router.post(
    '/:id/visits',
    requirePermission('visit:write'),
    validate('params', idParam),
    validate('body', createVisitBody),
    async (req, res) => {
      res.status(201).json(await createVisit(db, actorOf(req), res.locals.params.id, req.body))
    },
  )

  return router
}

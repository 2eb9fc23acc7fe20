import { Router } from 'express'
import type { z } from 'zod'
import { requirePermission } from '../middleware/require-permission'
import { validate } from '../middleware/validate'
import { computeFromDocument, computeWithUncertainty } from '../services/measurements'
import { computeBody, computeQuery } from '../schemas/measurements'

/** Stateless computation for any signed-in user; the engine then checks the geometry itself. */
export function measurementsRouter(): Router {
  const router = Router()
  router.post(
    '/compute',
    requirePermission('measurement:compute'),
    validate('query', computeQuery),
    validate('body', computeBody),
    (req, res) => {
      const query = res.locals.query as z.infer<typeof computeQuery>
      if (query.uncertainty === 'true') {
        res.json(
          computeWithUncertainty(req.body, { sigmaMm: query.sigmaMm, sigmaPx: query.sigmaPx }),
        )
        return
      }
      res.json(computeFromDocument(req.body))
    },
  )
  return router
}

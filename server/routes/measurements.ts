import { Router } from 'express'
import { z } from 'zod'
import { requirePermission } from '../middleware/require-permission'
import { validate } from '../middleware/validate'
import { computeFromDocument, computeWithUncertainty } from '../services/measurements'

const computeQuery = z.object({
  uncertainty: z.enum(['true', 'false'], { error: 'must be true or false' }).optional(),
  sigmaMm: z.coerce.number({ error: 'must be a number' }).positive('must be positive').max(20).optional(),
  sigmaPx: z.coerce.number({ error: 'must be a number' }).positive('must be positive').max(100).optional(),
})

/** Stateless computation for any signed-in user; the engine validates the document itself. */
export function measurementsRouter(): Router {
  const router = Router()
  router.post('/compute', requirePermission('measurement:compute'), validate('query', computeQuery), (req, res) => {
    const query = res.locals.query as z.infer<typeof computeQuery>
    if (query.uncertainty === 'true') {
      res.json(computeWithUncertainty(req.body, { sigmaMm: query.sigmaMm, sigmaPx: query.sigmaPx }))
      return
    }
    res.json(computeFromDocument(req.body))
  })
  return router
}

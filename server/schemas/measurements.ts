import { z } from 'zod'

/** Query of POST /api/measurements/compute: intervals on request, with σ overrides. */
export const computeQuery = z.object({
  uncertainty: z.enum(['true', 'false'], { error: 'must be true or false' }).optional(),
  sigmaMm: z.coerce
    .number({ error: 'must be a number' })
    .positive('must be positive')
    .max(20)
    .optional(),
  sigmaPx: z.coerce
    .number({ error: 'must be a number' })
    .positive('must be positive')
    .max(100)
    .optional(),
})

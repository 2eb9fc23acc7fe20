import { z } from 'zod'

export const auditQuery = z.object({
  entity: z.string().trim().max(40).optional(),
  entityId: z.string().trim().max(40).optional(),
  offset: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(0, 'cannot be negative')
    .default(0),
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(1)
    .max(200, 'must be at most 200')
    .default(50),
})

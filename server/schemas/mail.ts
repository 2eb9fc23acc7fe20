import { z } from 'zod'

export const mailListQuery = z.object({
  to: z.string().trim().max(254, 'must be at most 254 characters').optional(),
  offset: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(0, 'cannot be negative')
    .optional(),
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(1, 'must be at least 1')
    .max(100, 'must be at most 100')
    .optional(),
})

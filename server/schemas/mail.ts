import { z } from 'zod'
import { pagingQuery } from './common'

export const mailListQuery = z.object({
  to: z.string().trim().max(254, 'must be at most 254 characters').optional(),
  ...pagingQuery,
})

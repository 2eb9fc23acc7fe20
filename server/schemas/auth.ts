import { z } from 'zod'
import type { LoginInput } from '../../shared/types/api'

export const loginBody = z.object({
  email: z.email({ error: 'must be an e-mail address' }).max(254),
  password: z.string({ error: 'is required' }).min(1, 'is required').max(200),
}) satisfies z.ZodType<LoginInput>

import { z } from 'zod'
import type { LoginInput } from '../../shared/types/api'

export const loginBody = z.object({
  email: z.email({ error: 'must be an e-mail address' }).max(254),
  // bcrypt reads 72 bytes and ignores the rest: a longer password is refused, not cut short.
  password: z
    .string({ error: 'is required' })
    .min(1, 'is required')
    .refine((text) => Buffer.byteLength(text, 'utf8') <= 72, 'must be at most 72 bytes (UTF-8)'),
}) satisfies z.ZodType<LoginInput>

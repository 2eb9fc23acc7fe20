import { z } from 'zod'
import { ROLES } from '../../shared/types/domain'
import type {
  InvitationInput,
  PasswordInput,
  PasswordResetRequest,
  UserPatch,
} from '../../shared/types/accounts'

const email = z
  .email({ error: 'must be an e-mail address' })
  .max(254, 'must be at most 254 characters')
  .transform((text) => text.toLowerCase())

const displayName = z
  .string({ error: 'is required' })
  .trim()
  .min(1, 'is required')
  .max(120, 'must be at most 120 characters')

const role = z.enum(ROLES, { error: `must be one of ${ROLES.join(', ')}` })

export const invitationBody = z.strictObject({
  email,
  displayName,
  role,
}) satisfies z.ZodType<InvitationInput, unknown>

/** The rules themselves (length, bytes, e-mail name) are checked by the service with the address. */
export const passwordBody = z.strictObject({
  password: z.string({ error: 'is required' }).max(1000, 'is far too long'),
}) satisfies z.ZodType<PasswordInput>

export const passwordResetRequestBody = z.strictObject({
  email: z
    .string({ error: 'is required' })
    .trim()
    .min(1, 'is required')
    .max(254, 'must be at most 254 characters'),
}) satisfies z.ZodType<PasswordResetRequest>

export const tokenParam = z.object({
  token: z.string().regex(/^[A-Za-z0-9_-]{16,128}$/, 'is not a link token'),
})

export const userPatchBody = z
  .strictObject({
    role: role.optional(),
    active: z.boolean({ error: 'must be true or false' }).optional(),
    displayName: displayName.optional(),
  })
  .refine(
    (patch) => Object.keys(patch).length > 0,
    'change at least one of role, active, displayName',
  ) satisfies z.ZodType<UserPatch>

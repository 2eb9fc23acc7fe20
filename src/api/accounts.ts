import type { SessionUser } from '@shared/types/api'
import type { InvitationPreview, PasswordInput, PasswordResetPreview } from '@shared/types/accounts'
import { http } from './http'

export const getInvitation = (token: string) =>
  http.get<InvitationPreview>(`/invitations/${encodeURIComponent(token)}`)
/** Creates the account and signs it in. */
export const acceptInvitation = (token: string, input: PasswordInput) =>
  http.post<SessionUser>(`/invitations/${encodeURIComponent(token)}/accept`, input)

/** Always 202: the answer never says whether the address has an account. */
export const requestPasswordReset = (email: string) =>
  http.post<{ message: string }>('/auth/password-reset', { email })
export const getPasswordReset = (token: string) =>
  http.get<PasswordResetPreview>(`/auth/password-reset/${encodeURIComponent(token)}`)
export const completePasswordReset = (token: string, input: PasswordInput) =>
  http.post<void>(`/auth/password-reset/${encodeURIComponent(token)}`, input)

import type { AuditChainStatus, AuditEvent, Page, UserSummary } from '@shared/types/api'
import type { Invitation, InvitationInput, UserPatch } from '@shared/types/accounts'
import type { CaughtMail, UndeliveredMail } from '@shared/types/mail'
import { http, queryString } from './http'

export const listUsers = () => http.get<UserSummary[]>('/users')
/** Deactivating ends the user's sessions at once; the last administrator cannot be removed. */
export const patchUser = (id: number, patch: UserPatch) =>
  http.patch<UserSummary>(`/users/${id}`, patch)
export const listAuditEvents = (offset: number, limit: number) =>
  http.get<Page<AuditEvent>>(`/audit-events${queryString({ offset, limit })}`)
/** Recomputes the audit trail's hash chain on the server. */
export const checkAuditChain = () => http.get<AuditChainStatus>('/audit-events/chain')

export const listInvitations = () => http.get<Invitation[]>('/invitations')
export const createInvitation = (input: InvitationInput) =>
  http.post<Invitation>('/invitations', input)
export const revokeInvitation = (id: number) => http.delete<void>(`/invitations/${id}`)

export const listUndeliveredMail = (offset = 0, limit = 50) =>
  http.get<Page<UndeliveredMail>>(`/mail/undelivered${queryString({ offset, limit })}`)
export const resendMail = (id: number) => http.post<void>(`/mail/undelivered/${id}/resend`)
/** What the local fake mail server caught; 404 when it is off. */
export const listCaughtMail = (offset = 0, limit = 50) =>
  http.get<Page<CaughtMail>>(`/mail${queryString({ offset, limit })}`)

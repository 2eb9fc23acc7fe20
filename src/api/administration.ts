import type { AuditEvent, Page, UserSummary } from '@shared/types/api'
import { http, queryString } from './http'

export const listUsers = () => http.get<UserSummary[]>('/users')
export const listAuditEvents = (offset: number, limit: number) =>
  http.get<Page<AuditEvent>>(`/audit-events${queryString({ offset, limit })}`)

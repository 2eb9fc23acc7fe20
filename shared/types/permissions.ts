import type { Role } from './domain'

/**
 * What each role may do. The server enforces these on every route; the client uses the same
 * table only to hide what a role cannot use.
 */
export const PERMISSIONS = {
  /** Search and open patients (researchers get de-identified records). */
  'patient:read': ['surgeon', 'fellow', 'researcher'],
  /** Names, record numbers, birth and visit dates. */
  'patient:identify': ['surgeon', 'fellow'],
  'patient:write': ['surgeon', 'fellow'],
  'visit:write': ['surgeon', 'fellow'],
  'plan:write': ['surgeon'],
  'image:upload': ['surgeon', 'fellow'],
  /** Confirm, after looking at a film, that its pixels show no identity (researchers see it then). */
  'image:review-pixels': ['surgeon', 'fellow'],
  'reading:write': ['surgeon', 'fellow'],
  'reading:sign': ['surgeon'],
  /** The thread beside a reading's results (researchers see none). */
  'reading:comment': ['surgeon', 'fellow'],
  'measurement:compute': ['admin', 'surgeon', 'fellow', 'researcher'],
  /** Open studies: researchers only those they belong to. */
  'study:read': ['admin', 'surgeon', 'researcher'],
  /** Create and edit studies, choose their patients and researcher members. */
  'study:manage': ['admin', 'surgeon'],
  /** Start, close and reopen re-reading rounds of a study. */
  'round:manage': ['admin', 'surgeon'],
  /** A round's progress and reliability results: researchers only in the studies they belong to. */
  'round:read': ['admin', 'surgeon', 'researcher'],
  /** Read one's own blinded assignments of a round. */
  'round:rate': ['surgeon', 'fellow'],
  /** Measurement tables as CSV or XLSX: de-identified for researchers. */
  'export:measurements': ['surgeon', 'researcher'],
  'user:manage': ['admin'],
  'audit:read': ['admin'],
  'settings:write': ['admin'],
  /** The build's version and migration counts (the public health probe leaves them out). */
  'system:inspect': ['admin'],
  /** The outbox's undelivered mail and, in development, the mails the local fake caught. */
  'mail:read': ['admin'],
} as const satisfies Record<string, readonly Role[]>

export type Permission = keyof typeof PERMISSIONS

export function roleCan(role: Role, permission: Permission): boolean {
  return (PERMISSIONS[permission] as readonly Role[]).includes(role)
}

/**
 * Deleting or recalibrating a film changes what every reading of it rests on: the one who
 * uploaded it may, and surgeons (who sign readings) may; other fellows may not. Administrators
 * hold no film permissions at all.
 */
export function mayManageFilm(
  user: { id: number; role: Role },
  film: { uploadedBy: number | null },
): boolean {
  if (!roleCan(user.role, 'image:upload')) return false
  return user.role === 'surgeon' || film.uploadedBy === user.id
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  surgeon: 'Surgeon',
  fellow: 'Fellow',
  researcher: 'Researcher',
}

import type { Role } from './domain'

export interface InvitationInput {
  email: string
  displayName: string
  role: Role
}

/** A pending invitation as the administrator sees it (never its token). */
export interface Invitation {
  id: number
  email: string
  displayName: string
  role: Role
  invitedByName: string | null
  expiresAt: string
  createdAt: string
}

/** What the invitation link shows before a password is chosen. */
export interface InvitationPreview {
  email: string
  displayName: string
  role: Role
  expiresAt: string
}

export interface PasswordInput {
  password: string
}

export interface PasswordResetRequest {
  email: string
}

/** What a reset link shows before a new password is chosen. */
export interface PasswordResetPreview {
  email: string
  expiresAt: string
}

export interface UserPatch {
  role?: Role
  active?: boolean
  displayName?: string
}

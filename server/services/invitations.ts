import type { Db } from '../db/knex'
import {
  findPendingInvitationByHash,
  findPendingInvitationById,
  insertInvitation,
  listPendingInvitations,
  markInvitationAccepted,
  revokeInvitation as revokeInvitationRow,
  revokePendingInvitationsOf,
} from '../db/invitations'
import { findUserByEmail, insertUser } from '../db/users'
import { conflict, HttpError, notFound } from '../errors'
import { hashOneTimeToken, newOneTimeToken } from '../auth/one-time-token'
import type { Clock } from '../clock'
import type { Invitation, InvitationInput, InvitationPreview } from '../../shared/types/accounts'
import type { SessionUser } from '../../shared/types/api'
import { audit, type Actor } from './audit'
import { assertPasswordAllowed, hashPassword, type SignedInUser } from './auth'
import { loadSiteSettings } from './site-settings'
import { queueInvitationMail } from './account-notifications'

const linkGone = () =>
  new HttpError(
    404,
    'not_found',
    'This invitation link is no longer valid: it was used already, withdrawn or has expired. Ask your administrator for a new invitation.',
  )

const accountExists = (email: string) =>
  conflict(
    `An account for ${email} already exists; its owner can reset the password from the sign-in page.`,
    {
      email: ['email: an account with this address exists'],
    },
  )

export async function listInvitations(db: Db, now: Clock): Promise<Invitation[]> {
  return listPendingInvitations(db, now())
}

/** Mails a single-use link; a pending invitation of the same address is replaced. */
export async function createInvitation(
  db: Db,
  actor: Actor,
  input: InvitationInput,
  now: Clock,
): Promise<Invitation> {
  const email = input.email.trim().toLowerCase()
  if (await findUserByEmail(db, email)) throw accountExists(email)
  const { invitationLifetimeHours } = await loadSiteSettings(db)
  const { token, hash } = newOneTimeToken()
  return db.transaction(async (trx) => {
    const at = now()
    await revokePendingInvitationsOf(trx, email, at)
    const id = await insertInvitation(trx, {
      email,
      displayName: input.displayName,
      role: input.role,
      tokenHash: hash,
      invitedBy: actor.user.id,
      expiresAt: new Date(at.getTime() + invitationLifetimeHours * 3_600_000),
    })
    await queueInvitationMail(trx, {
      email,
      displayName: input.displayName,
      role: input.role,
      token,
      invitedByName: actor.user.displayName,
      lifetimeHours: invitationLifetimeHours,
    })
    await audit(
      trx,
      actor,
      'invite',
      'invitation',
      id,
      `Invited ${email} as ${input.role} (link valid ${invitationLifetimeHours} h)`,
    )
    const created = await findPendingInvitationById(trx, id, at)
    if (!created) throw notFound('invitation')
    return created
  })
}

export async function revokeInvitation(
  db: Db,
  actor: Actor,
  id: number,
  now: Clock,
): Promise<void> {
  await db.transaction(async (trx) => {
    const invitation = await findPendingInvitationById(trx, id, now())
    if (!invitation || !(await revokeInvitationRow(trx, id, now())))
      throw notFound('pending invitation')
    await audit(
      trx,
      actor,
      'revoke',
      'invitation',
      id,
      `Withdrew the invitation of ${invitation.email}`,
    )
  })
}

export async function previewInvitation(
  db: Db,
  token: string,
  now: Clock,
): Promise<InvitationPreview> {
  const invitation = await findPendingInvitationByHash(db, hashOneTimeToken(token), now())
  if (!invitation) throw linkGone()
  return {
    email: invitation.email,
    displayName: invitation.displayName,
    role: invitation.role,
    expiresAt: invitation.expiresAt,
  }
}

/** Creates the account with the chosen password and uses the link up; answers who signed in. */
export async function acceptInvitation(
  db: Db,
  token: string,
  password: string,
  ip: string | null,
  now: Clock,
): Promise<SignedInUser> {
  const hash = hashOneTimeToken(token)
  const preview = await findPendingInvitationByHash(db, hash, now())
  if (!preview) throw linkGone()
  assertPasswordAllowed(password, preview.email)
  const passwordHash = await hashPassword(password)
  return db.transaction(async (trx) => {
    // Locked, so two submissions of the same link create one account.
    const invitation = await findPendingInvitationByHash(trx, hash, now(), true)
    if (!invitation) throw linkGone()
    if (await findUserByEmail(trx, invitation.email)) throw accountExists(invitation.email)
    const userId = await insertUser(trx, {
      email: invitation.email,
      displayName: invitation.displayName,
      role: invitation.role,
      passwordHash,
    })
    await markInvitationAccepted(trx, invitation.id, userId, now())
    const user: SessionUser = {
      id: userId,
      email: invitation.email,
      displayName: invitation.displayName,
      role: invitation.role,
    }
    await audit(
      trx,
      { user, ip },
      'accept',
      'invitation',
      invitation.id,
      `Accepted the invitation as ${invitation.role}; account ${userId} created`,
    )
    return { user, sessionGeneration: 0 }
  })
}

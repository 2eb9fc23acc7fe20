import type { Db } from '../db/knex'
import { enqueueMails } from '../db/mail-outbox'
import { ROLE_LABELS } from '../../shared/types/permissions'
import type { Role } from '../../shared/types/domain'

function lifetimeText(hours: number): string {
  if (hours % 24 === 0) return hours === 24 ? '1 day' : `${hours / 24} days`
  return hours === 1 ? '1 hour' : `${hours} hours`
}

export async function queueInvitationMail(
  db: Db,
  invitation: {
    email: string
    displayName: string
    role: Role
    token: string
    invitedByName: string
    lifetimeHours: number
  },
): Promise<void> {
  await enqueueMails(db, [
    {
      to: invitation.email,
      subject: 'Your invitation to Endplate',
      text: [
        `Hello ${invitation.displayName},`,
        '',
        `${invitation.invitedByName} invited you to Endplate, the spine team's radiograph measurement workspace, as ${ROLE_LABELS[invitation.role].toLowerCase()}.`,
        '',
        `Choose your password with the link below within ${lifetimeText(invitation.lifetimeHours)}. The link works once; after that, sign in with your e-mail address and the password you chose.`,
      ].join('\n'),
      linkPath: `/invitation/${invitation.token}`,
    },
  ])
}

export async function queuePasswordResetMail(
  db: Db,
  reset: { email: string; displayName: string; token: string },
): Promise<void> {
  await enqueueMails(db, [
    {
      to: reset.email,
      subject: 'Reset your Endplate password',
      text: [
        `Hello ${reset.displayName},`,
        '',
        'Someone asked to reset the password of the Endplate account for this address. Choose a new password with the link below within 1 hour; the link works once, and setting a password signs you out everywhere.',
        '',
        'If you did not ask for this, ignore this mail: your password stays as it is.',
      ].join('\n'),
      linkPath: `/password-reset/${reset.token}`,
    },
  ])
}

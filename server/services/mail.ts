import type { Db } from '../db/knex'
import { listCaughtMails } from '../db/caught-mails'
import { listUndeliveredMails, requeueFailedMail } from '../db/mail-outbox'
import { HttpError, notFound } from '../errors'
import type { Clock } from '../clock'
import type { Page } from '../../shared/types/api'
import type { CaughtMail, UndeliveredMail } from '../../shared/types/mail'
import { audit, type Actor } from './audit'

/** What the local fake mail server caught; there is nothing to show when it is off. */
export async function readCaughtMail(
  db: Db,
  fakeOn: boolean,
  page: { offset?: number; limit?: number; to?: string },
): Promise<Page<CaughtMail>> {
  if (!fakeOn) {
    throw new HttpError(
      404,
      'not_found',
      'The local mail catcher is off (MAIL_FAKE=false): mail goes to the SMTP relay, and Endplate keeps no copy.',
    )
  }
  return listCaughtMails(db, { offset: page.offset ?? 0, limit: page.limit ?? 50, to: page.to })
}

export async function readUndeliveredMail(
  db: Db,
  page: { offset?: number; limit?: number },
): Promise<Page<UndeliveredMail>> {
  return listUndeliveredMails(db, { offset: page.offset ?? 0, limit: page.limit ?? 50 })
}

/** Puts a mail whose retries ran out back into the queue. */
export async function resendMail(db: Db, actor: Actor, id: number, now: Clock): Promise<void> {
  await db.transaction(async (trx) => {
    if (!(await requeueFailedMail(trx, id, now()))) throw notFound('undelivered mail given up')
    await audit(trx, actor, 'mail-resend', 'mail', id, `Queued mail ${id} to be sent again`)
  })
}

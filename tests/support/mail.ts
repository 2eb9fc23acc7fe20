import { expect } from 'vitest'
import { pino } from 'pino'
import type { Db } from '../../server/db/knex'
import { listCaughtMails } from '../../server/db/caught-mails'
import { startMailCatcher, type MailCatcher } from '../../server/mail/mail-catcher'
import { createMailSender, type MailSender } from '../../server/mail/mail-sender'
import type { Clock } from '../../server/clock'
import type { CaughtMail } from '../../shared/types/mail'

export const TEST_PUBLIC_URL = 'http://endplate.test.invalid'

export interface TestMail {
  catcher: MailCatcher
  sender: MailSender
  /** Delivers every due outbox mail to the fake and answers what it has caught, oldest first. */
  deliver(): Promise<CaughtMail[]>
  close(): Promise<void>
}

/** The project's fake mail server on a free port of 127.0.0.1, and a sender pointed at it. */
export async function startTestMail(
  db: Db,
  options: { now?: Clock; publicUrl?: string; smtpPort?: number } = {},
): Promise<TestMail> {
  const logger = pino({ level: 'silent' })
  const catcher = await startMailCatcher({ db, logger, port: 0 })
  const sender = createMailSender({
    db,
    logger,
    from: 'Endplate <endplate@clinic.invalid>',
    publicUrl: options.publicUrl ?? TEST_PUBLIC_URL,
    smtp: { host: '127.0.0.1', port: options.smtpPort ?? catcher.port, ignoreTls: true },
    now: options.now,
    firstRetryMs: 1000,
  })
  return {
    catcher,
    sender,
    async deliver() {
      await sender.runOnce()
      const { items } = await listCaughtMails(db, { offset: 0, limit: 100 })
      return items.reverse()
    },
    async close() {
      await sender.stop()
      await catcher.close()
    },
  }
}

/** The page a mail links to, below the public address (the link must be there, once). */
export function linkPathOf(mail: CaughtMail, publicUrl = TEST_PUBLIC_URL): string {
  const links =
    mail.text.match(/https?:\/\/\S+/g)?.filter((link) => link.startsWith(publicUrl)) ?? []
  const pageLinks = links.filter((link) => link !== publicUrl)
  expect(pageLinks).toHaveLength(1)
  return pageLinks[0]!.slice(publicUrl.length)
}

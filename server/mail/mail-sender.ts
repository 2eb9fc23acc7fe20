import nodemailer, { type Transporter } from 'nodemailer'
import type { Logger } from 'pino'
import type { Db } from '../db/knex'
import {
  claimMail,
  dueMailIds,
  markMailAttemptFailed,
  markMailSent,
  type OutboxRow,
} from '../db/mail-outbox'
import { systemClock, type Clock } from '../clock'

export interface SmtpSettings {
  host: string
  port: number
  /** The local fake offers no TLS; a real relay is asked for STARTTLS when it offers it. */
  ignoreTls: boolean
}

export interface MailSenderOptions {
  db: Db
  logger: Logger
  from: string
  publicUrl: string
  smtp: SmtpSettings
  now?: Clock
  /** How often the outbox is looked at. */
  pollMs?: number
  /** Attempts before a mail is given up (kept as failed, shown to the administrator). */
  maxAttempts?: number
  /** Wait after the first failure; each further failure doubles it, up to an hour. */
  firstRetryMs?: number
}

export interface MailSender {
  /** Looks at the outbox now and every pollMs until stop(). */
  start(): void
  /** Sends every due mail once; resolves with how many were delivered. */
  runOnce(): Promise<number>
  stop(): Promise<void>
}

const MAX_RETRY_MS = 60 * 60_000
/** A claim outlives any SMTP conversation (nodemailer's own timeouts are shorter). */
const CLAIM_MS = 5 * 60_000
const BATCH = 25

/** Exponential backoff: the wait after the `failures`-th failed attempt. */
export function retryDelayMs(failures: number, firstRetryMs: number): number {
  return Math.min(firstRetryMs * 2 ** Math.max(0, failures - 1), MAX_RETRY_MS)
}

/** The text that leaves: the message, its link under PUBLIC_URL, and a closing line. */
export function composeMailText(text: string, linkPath: string | null, publicUrl: string): string {
  const link = linkPath === null ? '' : `\n\nOpen in Endplate: ${publicUrl}${linkPath}`
  return `${text.trimEnd()}${link}\n\n--\nEndplate, ${publicUrl}\nMails from Endplate name no patient: sign in to see who a reading belongs to.\n`
}

/**
 * Delivers the outbox over SMTP in the background. A failure is logged and retried with
 * exponential backoff; after maxAttempts the mail stays in the outbox as failed until an
 * administrator sends it again. Nothing here ever reaches the user's request.
 */
export function createMailSender(options: MailSenderOptions): MailSender {
  const now = options.now ?? systemClock
  const pollMs = options.pollMs ?? 2000
  const maxAttempts = options.maxAttempts ?? 8
  const firstRetryMs = options.firstRetryMs ?? 30_000
  const transport: Transporter = nodemailer.createTransport({
    host: options.smtp.host,
    port: options.smtp.port,
    secure: false,
    ignoreTLS: options.smtp.ignoreTls,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
  let timer: ReturnType<typeof setTimeout> | null = null
  let running: Promise<number> | null = null
  let stopped = true

  async function deliver(mail: OutboxRow): Promise<boolean> {
    try {
      await transport.sendMail({
        from: options.from,
        to: mail.to,
        subject: mail.subject,
        text: composeMailText(mail.text, mail.linkPath, options.publicUrl),
      })
      await markMailSent(options.db, mail.id, now())
      return true
    } catch (error) {
      const failures = mail.attempts + 1
      const message = error instanceof Error ? error.message : String(error)
      const giveUp = failures >= maxAttempts
      const next = giveUp ? null : new Date(now().getTime() + retryDelayMs(failures, firstRetryMs))
      options.logger.warn(
        { mailId: mail.id, attempt: failures, giveUp, err: message },
        giveUp ? 'mail given up after repeated failures' : 'mail delivery failed; will retry',
      )
      await markMailAttemptFailed(options.db, mail.id, message, now(), next)
      return false
    }
  }

  async function sendDue(): Promise<number> {
    let delivered = 0
    const started = now()
    for (const id of await dueMailIds(options.db, started, BATCH)) {
      const mail = await claimMail(options.db, id, now(), new Date(now().getTime() + CLAIM_MS))
      if (mail && (await deliver(mail))) delivered += 1
    }
    return delivered
  }

  function runOnce(): Promise<number> {
    running ??= sendDue().finally(() => {
      running = null
    })
    return running
  }

  function schedule(): void {
    if (stopped) return
    timer = setTimeout(() => {
      timer = null
      runOnce()
        .catch((error: unknown) => options.logger.error({ err: error }, 'mail outbox check failed'))
        .finally(schedule)
    }, pollMs)
  }

  return {
    start() {
      if (!stopped) return
      stopped = false
      void runOnce()
        .catch((error: unknown) => options.logger.error({ err: error }, 'mail outbox check failed'))
        .finally(schedule)
    },
    runOnce,
    async stop() {
      stopped = true
      if (timer !== null) clearTimeout(timer)
      timer = null
      await running?.catch(() => undefined)
      transport.close()
    },
  }
}

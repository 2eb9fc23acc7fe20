import type { AddressInfo } from 'node:net'
import { SMTPServer } from 'smtp-server'
import { simpleParser, type AddressObject } from 'mailparser'
import type { Logger } from 'pino'
import type { Db } from '../db/knex'
import { insertCaughtMail } from '../db/caught-mails'

export interface MailCatcher {
  /** The port it listens on (a free one when started on port 0). */
  port: number
  close(): Promise<void>
}

/** Largest message accepted; Endplate's own mails are a few kilobytes of text. */
const MAX_MESSAGE_BYTES = 1024 * 1024

function addresses(field: AddressObject | AddressObject[] | undefined): string {
  const list = field === undefined ? [] : Array.isArray(field) ? field : [field]
  return list.map((entry) => entry.text).join(', ')
}

/**
 * The local fake mail server of development, the demo and the tests: it accepts every message on
 * 127.0.0.1 only, parses it and keeps it in the caught_mails table of its database (so catches
 * survive a restart and GET /api/mail reads them). Nothing is ever relayed onwards.
 */
export async function startMailCatcher(options: {
  db: Db
  logger: Logger
  host?: string
  port: number
}): Promise<MailCatcher> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: 'Endplate local mail catcher (nothing leaves this machine)',
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((parsed) =>
          insertCaughtMail(options.db, {
            to: addresses(parsed.to),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
          }),
        )
        .then(() => callback())
        .catch((error: unknown) => {
          options.logger.error({ err: error }, 'the mail catcher could not keep a message')
          callback(error instanceof Error ? error : new Error(String(error)))
        })
    },
  })
  server.on('error', (error) => options.logger.warn({ err: error }, 'mail catcher error'))
  const host = options.host ?? '127.0.0.1'
  await new Promise<void>((resolveListen, reject) => {
    server.server.once('error', reject)
    server.listen(options.port, host, () => {
      server.server.off('error', reject)
      resolveListen()
    })
  })
  const port = (server.server.address() as AddressInfo).port
  return {
    port,
    close: () => new Promise<void>((resolveClose) => server.close(() => resolveClose())),
  }
}

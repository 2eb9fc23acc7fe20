import { createServer } from 'node:http'
import { join } from 'node:path'
import { config } from './config'
import { createDb } from './db/knex'
import { createLogger } from './logger'
import { createApp } from './app'
import { startMailCatcher, type MailCatcher } from './mail/mail-catcher'
import { createMailSender } from './mail/mail-sender'
import { createLocalFileStore } from './storage/local-file-store'
import { sweepUploadLeftovers } from './services/upload-sweep'
import { closeIngestPool } from './images/ingest/ingest-pool'
import { closeExportPool } from './exports/export-row-pool'
import { createAuditSealer } from './services/audit-sealer'

/**
 * Starts the HTTP server (the only module that listens), the outbox's mail sender and, where
 * MAIL_FAKE is on, the local fake mail server it delivers to. Resolves once all are listening.
 */
export async function startServer(): Promise<{
  close(): Promise<void>
  url: string
  /** Where the local mail catcher listens; null when MAIL_FAKE is off or it could not start. */
  mailCatcherPort: number | null
}> {
  const logger = createLogger(config.LOG_LEVEL)
  const db = createDb(config.DB_NAME)
  const store = createLocalFileStore(config.uploadDirAbsolute)
  // Before listening: what a crash of the last run left in the uploads folder goes first.
  await sweepUploadLeftovers({
    db,
    store,
    tmpDir: join(config.uploadDirAbsolute, 'tmp'),
    logger,
  })
  let catcher: MailCatcher | null = null
  if (config.MAIL_FAKE) {
    try {
      catcher = await startMailCatcher({ db, logger, port: config.SMTP_PORT })
    } catch (error) {
      // Mail then waits in the outbox (retried, shown to the administrator); the app still runs.
      logger.error(
        { err: error },
        `the local mail catcher could not listen on 127.0.0.1:${config.SMTP_PORT}; mail stays in the outbox`,
      )
    }
  }
  const sender = createMailSender({
    db,
    logger,
    from: config.MAIL_FROM,
    publicUrl: config.publicUrl,
    smtp: { host: config.SMTP_HOST, port: config.SMTP_PORT, ignoreTls: config.MAIL_FAKE },
  })
  sender.start()
  const sealer = createAuditSealer({ db, logger })
  sealer.start()
  const server = createServer(createApp({ db, config, logger, store }))
  await new Promise<void>((resolveListen, reject) => {
    server.once('error', reject)
    server.listen(config.PORT, config.HOST, () => resolveListen())
  })
  const url = `http://${config.HOST}:${config.PORT}`
  return {
    url,
    mailCatcherPort: catcher?.port ?? null,
    async close() {
      const closed = new Promise<void>((resolveClose) => server.close(() => resolveClose()))
      // Idle keep-alive connections would otherwise hold close() open for seconds.
      server.closeAllConnections()
      await closed
      await sender.stop()
      await catcher?.close()
      await closeIngestPool()
      await closeExportPool()
      await sealer.stop()
      // The last events of this run get their seal now rather than from the next start.
      await sealer.sealNow().catch((error: unknown) => {
        logger.warn({ err: error }, 'audit events left queued; the next start seals them')
      })
      await db.destroy()
    },
  }
}

// `tsx server/index.ts` (npm run dev:server) runs the API alone against an already running database.
if (import.meta.url === `file://${process.argv[1]}`) {
  const running = await startServer()
  console.log(`Endplate API listening on ${running.url}`)
  const stop = async () => {
    await running.close()
    process.exit(0)
  }
  let stopping = false
  const stopOnce = () => {
    if (stopping) return
    stopping = true
    void stop()
  }
  process.on('SIGINT', stopOnce)
  process.on('SIGTERM', stopOnce)
}

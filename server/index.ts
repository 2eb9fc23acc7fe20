import { createServer } from 'node:http'
import { join } from 'node:path'
import { config } from './config'
import { createDb } from './db/knex'
import { createLogger } from './logger'
import { createApp } from './app'
import { createLocalFileStore } from './storage/local-file-store'
import { sweepUploadLeftovers } from './services/upload-sweep'
import { closeIngestPool } from './images/ingest/ingest-pool'

/** Starts the HTTP server; the only module that listens. Resolves once it is listening. */
export async function startServer(): Promise<{ close(): Promise<void>; url: string }> {
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
  const server = createServer(createApp({ db, config, logger, store }))
  await new Promise<void>((resolveListen, reject) => {
    server.once('error', reject)
    server.listen(config.PORT, config.HOST, () => resolveListen())
  })
  const url = `http://${config.HOST}:${config.PORT}`
  return {
    url,
    async close() {
      const closed = new Promise<void>((resolveClose) => server.close(() => resolveClose()))
      // Idle keep-alive connections would otherwise hold close() open for seconds.
      server.closeAllConnections()
      await closed
      await closeIngestPool()
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

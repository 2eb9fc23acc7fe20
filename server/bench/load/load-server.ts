// Child process of the load bench: serves either the whole app on the bench database, or a bare
// Express route (the machine's ceiling), on a free loopback port, and tells the parent the port.
// A process of its own, so the load generator does not share the server's event loop.
import type { AddressInfo } from 'node:net'
import express from 'express'
import { pino } from 'pino'

const [mode, databaseName, uploadDir] = process.argv.slice(2)

async function appToServe(): Promise<express.Express> {
  if (mode === 'bare') {
    const bare = express()
    bare.get('/bare', (_req, res) => {
      res.json({ ok: true })
    })
    return bare
  }
  const { config } = await import('../../config')
  const { createDb } = await import('../../db/knex')
  const { createApp } = await import('../../app')
  const { createLocalFileStore } = await import('../../storage/local-file-store')
  // Requests are logged as in production (info), to /dev/null: the cost of writing the line is
  // measured, the terminal is not.
  const logger = pino({ level: 'info' }, pino.destination('/dev/null'))
  const db = createDb(databaseName as string)
  // As in production, the audit trail is chained while the load runs.
  const { createAuditSealer } = await import('../../services/audit-sealer')
  createAuditSealer({ db, logger }).start()
  return createApp({
    db,
    config: { ...config, NODE_ENV: 'production' },
    logger,
    clientDir: '/nonexistent',
    store: createLocalFileStore(uploadDir as string),
  })
}

const app = await appToServe()
const server = app.listen(0, '127.0.0.1', () => {
  process.send?.({ port: (server.address() as AddressInfo).port })
})
process.on('disconnect', () => {
  server.close()
  process.exit(0)
})

import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { config } from '../../server/config'
import { createDb, type Db } from '../../server/db/knex'
import {
  databaseAccounts,
  ensureDatabases,
  mariaDbPaths,
  startMariaDb,
  stopMariaDb,
  type MariaDbPaths,
} from '../../server/cli/mariadb'

function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address()
      const port = typeof address === 'object' && address ? address.port : 0
      probe.close(() => resolvePort(port))
    })
  })
}

/**
 * A MariaDB of its own, in a temporary data folder on a free port, for tests that pause, stop
 * and restart the database: the project's shared test server must never be touched, since
 * other test files use it at the same time.
 */
export interface PrivateMariaDb {
  port: number
  paths: MariaDbPaths
  database: string
  /** A pool with the API's timeouts on the private server. */
  openDb(): Db
  pause(): void
  resume(): void
  stop(): Promise<void>
  start(): Promise<void>
  /** Stops the server and removes its data folder. */
  remove(): Promise<void>
}

export async function startPrivateMariaDb(): Promise<PrivateMariaDb> {
  const root = mkdtempSync(join(tmpdir(), 'endplate-private-db-'))
  const paths = mariaDbPaths(join(root, 'data'))
  const port = await freePort()
  const database = 'endplate_private'
  await startMariaDb(paths, port)
  await ensureDatabases(paths, [database], databaseAccounts(config))
  const pid = () => Number(readFileSync(paths.pidFile, 'utf8').trim())
  let paused = false
  const server: PrivateMariaDb = {
    port,
    paths,
    database,
    openDb: () => createDb(database, { port }),
    pause() {
      process.kill(pid(), 'SIGSTOP')
      paused = true
    },
    resume() {
      if (!paused) return
      process.kill(pid(), 'SIGCONT')
      paused = false
    },
    async stop() {
      server.resume()
      await stopMariaDb(paths)
    },
    async start() {
      await startMariaDb(paths, port)
    },
    async remove() {
      await server.stop()
      rmSync(root, { recursive: true, force: true })
    },
  }
  return server
}

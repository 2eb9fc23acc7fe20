/**
 * `npm start`: everything from a fresh machine to the running demo. Installs and starts the
 * project's MariaDB, migrates, seeds the demo on an empty database, builds the client and serves
 * app and API from one Express process. Ctrl-C stops Express and the MariaDB it started.
 */
import { ensureEnvFile } from './env-file'
import { run } from './shell'

ensureEnvFile()
const { config } = await import('../config')
const { bringUpDatabase, migrateLatest, withDb } = await import('./database-lifecycle')
const { seedDemoWhenEmpty } = await import('./demo-seed')
const { printWelcome } = await import('./welcome')

const database = await bringUpDatabase(config, [config.DB_NAME, config.DB_TEST_NAME])
let stopping = false
async function shutdown(code: number, server?: { close(): Promise<void> }): Promise<never> {
  if (!stopping) {
    stopping = true
    console.log('\nStopping Endplate ...')
    await server?.close().catch(() => undefined)
    await database.release().catch((error: unknown) => console.error(error))
  }
  process.exit(code)
}
process.once('SIGINT', () => void shutdown(0))
process.once('SIGTERM', () => void shutdown(0))

try {
  await withDb(config.DB_NAME, async (db) => {
    await migrateLatest(db)
    await seedDemoWhenEmpty(db)
  })
  console.log('Building the client ...')
  await run('npx', ['vite', 'build', '--logLevel', 'warn'])
  const { startServer } = await import('../index')
  const server = await startServer()
  process.removeAllListeners('SIGINT')
  process.removeAllListeners('SIGTERM')
  process.once('SIGINT', () => void shutdown(0, server))
  process.once('SIGTERM', () => void shutdown(0, server))
  printWelcome(server.url)
} catch (error) {
  console.error(error instanceof Error ? error.message : error)
  await shutdown(1)
}

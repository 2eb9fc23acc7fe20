/**
 * `npm start`: everything from a fresh machine to the running demo. Installs and starts the
 * project's MariaDB, migrates, seeds the demo on an empty database when asked to (`--demo`, which
 * `npm start` passes; never with NODE_ENV=production), builds the client and serves app and API
 * from one Express process. Ctrl-C stops Express and the MariaDB it started.
 */
import { ensureEnvFile } from './env-file'
import { failClearly } from './fail-clearly'
import { run } from './shell'

failClearly()
ensureEnvFile()
const { config } = await import('../config')
const { bringUpDatabase, migrateLatest, withDb } = await import('./database-lifecycle')
const { demoRequested, seedDemoWhenEmpty } = await import('./demo-seed')
const { printWelcome } = await import('./welcome')

// Demo accounts have published passwords: only an explicit request seeds them.
const seedDemo = demoRequested(process.argv, config.NODE_ENV)
if (process.argv.includes('--demo') && !seedDemo)
  console.log('NODE_ENV=production: the demo is not seeded.')

const database = await bringUpDatabase(config, [config.DB_NAME, config.DB_TEST_NAME])
let stopping = false
let running: Awaited<ReturnType<typeof import('../index').startServer>> | undefined
/**
 * Ctrl-C reaches npm, tsx and this process at once, so the signal can arrive twice: the first
 * starts the shutdown, later ones are ignored until MariaDB has been stopped cleanly.
 */
async function shutdown(code: number): Promise<void> {
  if (stopping) return
  stopping = true
  console.log('\nStopping Endplate ...')
  await running?.close().catch(() => undefined)
  await database.release().catch((error: unknown) => console.error(error))
  process.exit(code)
}
process.on('SIGINT', () => void shutdown(0))
process.on('SIGTERM', () => void shutdown(0))

try {
  await withDb(config.DB_NAME, async (db) => {
    await migrateLatest(db)
    if (seedDemo) await seedDemoWhenEmpty(db)
  })
  console.log('Building the client ...')
  await run('npx', ['vite', 'build', '--logLevel', 'warn'])
  const { startServer } = await import('../index')
  running = await startServer()
  printWelcome(running.url, running.mailCatcherPort, seedDemo)
} catch (error) {
  console.error(error instanceof Error ? error.message : error)
  await shutdown(1)
}

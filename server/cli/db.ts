/**
 * Database chores: `npm run db:start | db:stop | db:migrate | db:seed | db:reset`.
 * db:reset drops every table of the development database, migrates and seeds the demo afresh.
 */
import { ensureEnvFile } from './env-file'
import { failClearly } from './fail-clearly'

failClearly()
ensureEnvFile()
const { config } = await import('../config')
const { bringUpDatabase, dropAllTables, migrateLatest, withDb } =
  await import('./database-lifecycle')
const { mariaDbPaths, stopMariaDb } = await import('./mariadb')

const command = process.argv[2]
if (config.NODE_ENV === 'production' && (command === 'seed' || command === 'reset')) {
  console.error(`db:${command} replaces data with the demo and never runs in production.`)
  process.exit(2)
}
const databases = [config.DB_NAME, config.DB_TEST_NAME]

switch (command) {
  case 'start':
    await bringUpDatabase(config, databases)
    break
  case 'stop':
    await stopMariaDb(mariaDbPaths(config.dataDirAbsolute))
    break
  case 'migrate':
    await bringUpDatabase(config, databases)
    await withDb(config.DB_NAME, migrateLatest)
    break
  case 'seed':
    await bringUpDatabase(config, databases)
    await withDb(config.DB_NAME, async (db) => {
      await migrateLatest(db)
      await db.seed.run()
    })
    console.log('Demo data seeded.')
    break
  case 'reset':
    await bringUpDatabase(config, databases)
    await withDb(config.DB_NAME, async (db) => {
      await dropAllTables(db)
      await migrateLatest(db)
      await db.seed.run()
    })
    console.log('Database reset to the demo data.')
    break
  default:
    console.error('Usage: tsx server/cli/db.ts start|stop|migrate|seed|reset')
    process.exit(2)
}

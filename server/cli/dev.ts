/**
 * `npm run dev`: the database, the API under `tsx watch`, and Vite's dev server with hot module
 * replacement proxying /api to it.
 */
import { spawn } from 'node:child_process'
import { ensureEnvFile } from './env-file'
import { failClearly } from './fail-clearly'

failClearly()
ensureEnvFile()
const { config } = await import('../config')
const { bringUpDatabase, migrateLatest, withDb } = await import('./database-lifecycle')
const { demoRequested, seedDemoWhenEmpty } = await import('./demo-seed')

const database = await bringUpDatabase(config, [config.DB_NAME, config.DB_TEST_NAME])
await withDb(config.DB_NAME, async (db) => {
  await migrateLatest(db)
  if (demoRequested(process.argv, config.NODE_ENV)) await seedDemoWhenEmpty(db)
})
const children = [
  spawn('npx', ['tsx', 'watch', 'server/index.ts'], { stdio: 'inherit' }),
  spawn('npx', ['vite'], { stdio: 'inherit' }),
]
let stopping = false
const stop = async () => {
  if (stopping) return
  stopping = true
  for (const child of children) child.kill('SIGTERM')
  await database.release()
  process.exit(0)
}
process.on('SIGINT', () => void stop())
process.on('SIGTERM', () => void stop())

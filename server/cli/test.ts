/**
 * `npm test`: the same set-up as `npm start` against the test databases, then every check:
 * typecheck, lint, client build, and vitest (unit, API against the real MariaDB, browser tests
 * in Debian's Chromium). Exits non-zero when any step fails.
 */
import { existsSync } from 'node:fs'
import { ensureEnvFile } from './env-file'
import { failClearly } from './fail-clearly'
import { aptInstall, run } from './shell'

failClearly()
ensureEnvFile()
const { config } = await import('../config')
const { bringUpDatabase } = await import('./database-lifecycle')

if (!existsSync('/usr/bin/chromium')) {
  console.log('Chromium is missing; installing it from Debian for the browser tests ...')
  await aptInstall(['chromium', 'fonts-dejavu-core'])
}

const database = await bringUpDatabase(config, [config.DB_TEST_NAME])
const steps: Array<[name: string, command: string, args: string[]]> = [
  ['typecheck', 'npm', ['run', '-s', 'typecheck']],
  ['lint', 'npm', ['run', '-s', 'lint']],
  ['build', 'npx', ['vite', 'build', '--logLevel', 'warn']],
  ['vitest', 'npx', ['vitest', 'run']],
]
const failed: string[] = []
try {
  for (const [name, command, args] of steps) {
    console.log(`\n=== ${name} ===`)
    try {
      await run(command, args, { env: { ...process.env, NODE_ENV: 'test' } })
    } catch {
      failed.push(name)
    }
  }
} finally {
  await database.release()
}
if (failed.length > 0) {
  console.error(`\nFailed: ${failed.join(', ')}`)
  process.exit(1)
}
console.log('\nAll checks passed.')

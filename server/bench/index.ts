// `npm run bench`: runs every server/bench/*.bench.ts module in alphabetical order. Each module
// exports `run(): Promise<void>` and prints its own figures; this runner only finds, orders and
// heads them, so a new benchmark needs no registration. It first does the set-up the benches
// need (the project's MariaDB, a built client), as `npm start` would.
import { existsSync } from 'node:fs'
import { readdir } from 'node:fs/promises'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { ensureEnvFile } from '../cli/env-file'
import { run as runCommand } from '../cli/shell'
import { projectRoot } from '../project-root'

ensureEnvFile()
const { config } = await import('../config')
const { bringUpDatabase } = await import('../cli/database-lifecycle')
const database = await bringUpDatabase(config, [config.DB_NAME])
if (!existsSync(join(projectRoot, 'dist', 'index.html'))) {
  await runCommand('npx', ['vite', 'build', '--logLevel', 'warn'])
}

interface BenchModule {
  run?: unknown
}

const here = dirname(fileURLToPath(import.meta.url))
const files = (await readdir(here)).filter((name) => name.endsWith('.bench.ts')).sort()

if (files.length === 0) console.log('no *.bench.ts modules found')
for (const file of files) {
  console.log(`\n== ${file.replace(/\.bench\.ts$/, '')} ==`)
  const module = (await import(pathToFileURL(join(here, file)).href)) as BenchModule
  if (typeof module.run !== 'function') {
    console.log(`skipped: ${file} exports no run()`)
    process.exitCode = 1
    continue
  }
  await (module.run as () => Promise<void>)()
}
await database.release()

// `npm run bench`: runs every server/bench/*.bench.ts module in alphabetical order. Each module
// exports `run(): Promise<void>` and prints its own figures; this runner only finds, orders and
// heads them, so a new benchmark needs no registration.
import { readdir } from 'node:fs/promises'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'

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

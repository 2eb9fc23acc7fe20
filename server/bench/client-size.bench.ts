// The client's initial JavaScript, gzip-compressed: what the sign-in page and the worklist (a
// signed-in user's first screen) download when opened directly; both are lazily loaded routes,
// so each is the entry's graph plus the route's own. Built fresh from the current source into a scratch folder, with Vite's manifest, so
// a stale dist/ cannot flatter the figure. Target: under 200 KB each (the target; 1 KB =
// 1000 bytes, as Vite prints them). Prints figures only; no assertions.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { gzipSync } from 'node:zlib'
import { run as runCommand } from '../cli/shell'
import { projectRoot } from '../project-root'
import { initialScriptFiles, staticClosureFiles, type Manifest } from './client-bundle-graph'

const TARGET_KB = 200
const ROUTES = [
  ['sign-in page', 'src/views/SignInView.vue'],
  ['worklist', 'src/views/WorklistView.vue'],
] as const

function gzipKb(outDir: string, files: Iterable<string>): number {
  let bytes = 0
  for (const file of files) bytes += gzipSync(readFileSync(join(outDir, file)), { level: 9 }).length
  return bytes / 1000
}

export async function run(): Promise<void> {
  const outDir = mkdtempSync(join(tmpdir(), 'endplate-bench-client-'))
  try {
    await runCommand(
      'npx',
      ['vite', 'build', '--logLevel', 'error', '--manifest', '--outDir', outDir, '--emptyOutDir'],
      { cwd: projectRoot },
    )
    const html = readFileSync(join(outDir, 'index.html'), 'utf8')
    const manifest = JSON.parse(
      readFileSync(join(outDir, '.vite', 'manifest.json'), 'utf8'),
    ) as Manifest
    const entryKey = Object.keys(manifest).find((key) => manifest[key]?.isEntry)
    if (!entryKey) throw new Error('the build manifest names no entry')
    // The HTML's own list, widened by the manifest in case a preload link were ever dropped.
    const shell = [...initialScriptFiles(html), ...staticClosureFiles(manifest, entryKey)]
    console.log('client-size.bench: initial JavaScript, gzip level 9, fresh production build')
    for (const [label, source] of ROUTES) {
      // A route imported statically has no chunk of its own: it is already in the shell.
      const route = manifest[source] ? staticClosureFiles(manifest, source) : []
      const files = new Set([...shell, ...route])
      const kb = gzipKb(outDir, files)
      console.log(
        `  ${label.padEnd(13)} ${kb.toFixed(1).padStart(6)} KB in ${files.size} files (target < ${TARGET_KB} KB) ${kb < TARGET_KB ? 'MET' : 'MISSED'}`,
      )
    }
  } finally {
    rmSync(outDir, { recursive: true, force: true })
  }
}

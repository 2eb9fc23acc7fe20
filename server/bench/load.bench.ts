// Load on loopback at 50 connections (autocannon), against the app serving a bench database of
// 10 000 patients and 100 000 readings: the patient list, a reading save (PATCH with version,
// each connection its own draft so saves never 409) and a rendition fetch; and, in the same run,
// a bare Express route as this machine's ceiling. Target: p95 < 50 ms for the list and the save.
// The server runs in a child process so it does not share the load generator's event loop.
import { fork, type ChildProcess } from 'node:child_process'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import type autocannon from 'autocannon'
import { config } from '../config'
import { openMigratedDatabase, withDb } from '../cli/database-lifecycle'
import { signSessionToken, SESSION_COOKIE, tokenSettingsOf } from '../auth/session-token'
import { projectRoot } from '../project-root'
import { LOAD_PATIENTS, LOAD_POINTS, LOAD_READINGS, seedLoadBench } from './load/seed-load'
import { runLoad, type LoadFigures } from './load/run-autocannon'

const CONNECTIONS = 50
const DURATION_SECONDS = 10
const P95_TARGET_MS = 50
const DATABASE = `${config.DB_NAME}_bench_load`
const UPLOAD_DIR = join(projectRoot, '.data', 'bench-load-uploads')
const SERVER_ENTRY = fileURLToPath(new URL('./load/load-server.ts', import.meta.url))

async function startServer(mode: 'app' | 'bare'): Promise<{ child: ChildProcess; origin: string }> {
  const child = fork(SERVER_ENTRY, [mode, DATABASE, UPLOAD_DIR], { stdio: 'inherit' })
  const port = await new Promise<number>((resolve, reject) => {
    child.once('message', (message) => resolve((message as { port: number }).port))
    child.once('exit', (code) => reject(new Error(`load server exited with ${code}`)))
  })
  return { child, origin: `http://127.0.0.1:${port}` }
}

async function stopServer(child: ChildProcess): Promise<void> {
  const exited = new Promise((resolve) => child.once('exit', resolve))
  child.disconnect()
  await exited
}

function line(label: string, figures: LoadFigures, target?: number): void {
  const verdict = target === undefined ? '' : figures.p95Ms < target ? '  MET' : '  MISSED'
  console.log(
    `  ${label.padEnd(34)} ${figures.requestsPerSecond.toFixed(0).padStart(6)} req/s  p50 ${figures.p50Ms.toFixed(1)} ms  p95 ${figures.p95Ms.toFixed(1)} ms  p99 ${figures.p99Ms.toFixed(1)} ms  (${figures.total} requests, ${figures.non2xx} non-2xx, ${figures.errors} errors)${target === undefined ? '' : `  target p95 < ${target} ms:${verdict}`}`,
  )
}

export async function run(): Promise<void> {
  await (await openMigratedDatabase(config, DATABASE)).destroy()
  // Seeding runs statements longer than the API's statement timeout: a maintenance pool.
  const seed = await withDb(DATABASE, (db) => seedLoadBench(db, UPLOAD_DIR))
  const token = signSessionToken(seed.fellowId, 'fellow', {
    ...tokenSettingsOf(config),
    lifetimeMinutes: 24 * 60,
  })
  const headers = { cookie: `${SESSION_COOKIE}=${token}` }
  console.log(
    `load.bench: ${LOAD_PATIENTS} patients, ${LOAD_READINGS} readings; ${CONNECTIONS} connections, ${DURATION_SECONDS} s each, loopback; server in a child process`,
  )

  const bare = await startServer('bare')
  const ceiling = await runLoad({
    url: `${bare.origin}/bare`,
    connections: CONNECTIONS,
    durationSeconds: DURATION_SECONDS,
  })
  await stopServer(bare.child)

  const app = await startServer('app')
  try {
    // A short warm-up, so the first figures do not carry the pool's connects and JIT.
    await runLoad({
      url: `${app.origin}/api/patients`,
      connections: 10,
      durationSeconds: 2,
      headers,
    })
    const list = await runLoad({
      url: `${app.origin}/api/patients`,
      connections: CONNECTIONS,
      durationSeconds: DURATION_SECONDS,
      headers,
    })
    let nextDraft = 0
    const save = await runLoad({
      url: app.origin,
      connections: CONNECTIONS,
      durationSeconds: DURATION_SECONDS,
      // Each connection saves its own draft and counts its version up after each accepted save.
      setupClient: (client: autocannon.Client) => {
        const readingId = seed.draftReadingIds[nextDraft++] as number
        let version = seed.draftVersions.get(readingId) ?? 1
        const request = () =>
          client.setRequests([
            {
              method: 'PATCH',
              path: `/api/readings/${readingId}`,
              // A scripted write carries no Sec-Fetch-Site, so it names its origin as a page would.
              headers: { ...headers, origin: app.origin, 'content-type': 'application/json' },
              body: JSON.stringify({ points: LOAD_POINTS, version }),
            },
          ])
        request()
        client.on('response', (status: number) => {
          if (status === 200) version += 1
          request()
        })
      },
    })
    const rendition = await runLoad({
      url: `${app.origin}/api/images/${seed.imageIds[0]}/files/display`,
      connections: CONNECTIONS,
      durationSeconds: DURATION_SECONDS,
      headers,
    })
    line('bare Express route (ceiling)', ceiling)
    line('GET /api/patients (first page)', list, P95_TARGET_MS)
    line('PATCH /api/readings/:id (save)', save, P95_TARGET_MS)
    line('GET /api/images/:id/files/display', rendition)
    const ratio = (figures: LoadFigures) =>
      (ceiling.requestsPerSecond / figures.requestsPerSecond).toFixed(1)
    console.log(
      `  ceiling ÷ route (req/s): list ${ratio(list)}×, save ${ratio(save)}×, rendition ${ratio(rendition)}×`,
    )
  } finally {
    await stopServer(app.child)
  }
}

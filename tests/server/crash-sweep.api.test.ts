import { spawn, type ChildProcess } from 'node:child_process'
import {
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs'
import { request as httpRequest } from 'node:http'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import sharp from 'sharp'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { projectRoot } from '../../server/project-root'
import { openTestDb, truncateAll, workerDatabaseName } from '../support/test-db'
import { createTestUser, testConfig, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { pino } from 'pino'
import { sweepUploadLeftovers } from '../../server/services/upload-sweep'
import { createLocalFileStore } from '../../server/storage/local-file-store'

let db: Db
let uploadDir: string
let fellow: TestUser
let visitId: number
let port: number
const children: ChildProcess[] = []

function freePort(): Promise<number> {
  return new Promise((resolvePort) => {
    const probe = createServer()
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address()
      probe.close(() => resolvePort(typeof address === 'object' && address ? address.port : 0))
    })
  })
}

/** The real server (server/index.ts, as `npm run dev:server` runs it) on the worker's database. */
function startServerProcess(): Promise<{ child: ChildProcess; output: () => string }> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: projectRoot,
    env: {
      ...process.env,
      ENDPLATE_SKIP_ENV_FILE: '1',
      NODE_ENV: 'test',
      LOG_LEVEL: 'info',
      PORT: String(port),
      PUBLIC_URL: `http://127.0.0.1:${port}`,
      DB_NAME: workerDatabaseName(),
      UPLOAD_DIR: uploadDir,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  children.push(child)
  let output = ''
  child.stdout?.on('data', (chunk: Buffer) => (output += chunk.toString()))
  child.stderr?.on('data', (chunk: Buffer) => (output += chunk.toString()))
  return new Promise((resolveStart, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start:\n${output}`)), 30_000)
    const check = () => {
      if (output.includes('listening on')) {
        clearTimeout(timer)
        resolveStart({ child, output: () => output })
      }
    }
    child.stdout?.on('data', check)
    child.once('exit', (code) => {
      clearTimeout(timer)
      reject(new Error(`server exited (${code}):\n${output}`))
    })
  })
}

function kill(child: ChildProcess): Promise<void> {
  return new Promise((resolveExit) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolveExit()
    child.removeAllListeners('exit')
    child.once('exit', () => resolveExit())
    child.kill('SIGKILL')
  })
}

function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return []
  return readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((entry) => entry.isFile())
    .map((entry) => join(entry.parentPath, entry.name))
}

async function until(condition: () => boolean, what: string): Promise<void> {
  for (let i = 0; i < 600; i++) {
    if (condition()) return
    await new Promise((resolveWait) => setTimeout(resolveWait, 10))
  }
  throw new Error(`timed out waiting for ${what}`)
}

/**
 * Starts a multipart upload by hand and sends `sendBytes` of the file, leaving the request
 * open (the client is "still sending" when the server dies).
 */
function startUpload(file: Buffer, name: string, sendBytes = file.length) {
  const boundary = 'endplate-crash-test'
  const head = Buffer.from(
    `--${boundary}\r\nContent-Disposition: form-data; name="view"\r\n\r\nlateral-neutral\r\n` +
      `--${boundary}\r\nContent-Disposition: form-data; name="confirmPatientMismatch"\r\n\r\ntrue\r\n` +
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\n` +
      'Content-Type: application/octet-stream\r\n\r\n',
  )
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`)
  const req = httpRequest({
    host: '127.0.0.1',
    port,
    method: 'POST',
    path: `/api/visits/${visitId}/images`,
    headers: {
      Cookie: fellow.cookie,
      // A scripted client names its site as a browser would.
      'Sec-Fetch-Site': 'same-origin',
      'Content-Type': `multipart/form-data; boundary=${boundary}`,
      'Content-Length': head.length + file.length + tail.length,
    },
  })
  req.on('error', () => {})
  req.write(head)
  req.write(file.subarray(0, sendBytes))
  if (sendBytes === file.length) req.end(tail)
  return req
}

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-crash-'))
  port = await freePort()
  // The child's public address is the token issuer its sessions must name.
  fellow = await createTestUser(
    db,
    testConfig({ PUBLIC_URL: `http://127.0.0.1:${port}` }),
    'fellow',
  )
  const patientId = await insertTestPatient(db, fellow.id)
  visitId = await insertTestVisit(db, patientId, fellow.id)
})

afterAll(async () => {
  for (const child of children) await kill(child)
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})

describe('a server killed with SIGKILL during uploads', () => {
  it('leaves, after the next start, no image row without its files and no file without a row', async () => {
    const kept = await sharp(Buffer.alloc(64 * 48, 90), {
      raw: { width: 64, height: 48, channels: 1 },
    })
      .png()
      .toBuffer()
    const big = (await smallPhantomFiles({ widthPx: 1500, heightPx: 1250, seed: 4 })).dicom
    const tmp = join(uploadDir, 'tmp')

    // 1. One film is filed normally and must survive everything below.
    let server = await startServerProcess()
    const filed = await request(`http://127.0.0.1:${port}`)
      .post(`/api/visits/${visitId}/images`)
      .set('Cookie', fellow.cookie)
      .set('Sec-Fetch-Site', 'same-origin')
      .field('view', 'lateral-neutral')
      .attach('file', kept, 'kept.png')
    expect(filed.status).toBe(201)

    // 2. Killed while a film is still streaming in: a half-written temporary file.
    startUpload(big, 'streaming.dcm', big.length >> 1)
    await until(
      () => filesUnder(tmp).some((path) => path.endsWith('.upload') && statSync(path).size > 0),
      'the streamed upload on disk',
    )
    await kill(server.child)

    // 3. Killed once a whole film has arrived, while it is decoded, rendered or filed.
    server = await startServerProcess()
    startUpload(big, 'decoding.dcm')
    await until(
      () =>
        filesUnder(tmp).some((path) => path.endsWith('.rendition')) ||
        filesUnder(join(uploadDir, 'films')).length > 5,
      'decoding to begin',
    )
    await kill(server.child)

    // 4. What a kill between moving files in and committing leaves: an original and a
    // half-written rendition (put() writes a .part file first) under a hash no row has.
    const strayFolder = join(uploadDir, 'films', 'ab', 'ab'.padEnd(64, 'c'))
    mkdirSync(strayFolder, { recursive: true })
    writeFileSync(join(strayFolder, 'original.dcm'), big)
    writeFileSync(join(strayFolder, 'display.png.0b5e5c1e-part.part'), Buffer.alloc(0))
    expect(filesUnder(tmp).length).toBeGreaterThan(0)

    server = await startServerProcess()
    expect(server.output()).toMatch(/Start-up sweep removed/)

    const rows = await db(TABLES.images)
    const referenced = new Set(
      rows.flatMap((row) =>
        ['original_path', 'display_path', 'preview_path', 'thumbnail_path', 'full_depth_path'].map(
          (column) => join(uploadDir, row[column] as string),
        ),
      ),
    )
    const onDisk = filesUnder(uploadDir)
    // No image row without its file...
    for (const path of referenced) expect(onDisk).toContain(path)
    // ...and no file without a row: nothing temporary, nothing unreferenced.
    expect(onDisk.filter((path) => !referenced.has(path))).toEqual([])
    expect(rows.map((row) => row.original_name)).toContain('kept.png')
    // The content rows follow the images.
    const contents = await db(TABLES.filmFiles).pluck('content_hash')
    expect(contents.sort()).toEqual([...new Set(rows.map((row) => row.content_hash))].sort())

    // The server that swept serves the surviving film.
    const display = await request(`http://127.0.0.1:${port}`)
      .get(`/api/images/${filed.body[0].id}/files/display`)
      .set('Cookie', fellow.cookie)
    expect(display.status).toBe(200)
  }, 120_000)
})

describe('sweepUploadLeftovers', () => {
  it('leaves alone what was written after the sweep began (another process may own it)', async () => {
    const root = mkdtempSync(join(tmpdir(), 'endplate-sweep-'))
    const tmp = join(root, 'tmp')
    mkdirSync(tmp)
    writeFileSync(join(tmp, 'old.upload'), 'x')
    const folder = join(root, 'films', 'de', 'de'.padEnd(64, 'f'))
    mkdirSync(folder, { recursive: true })
    writeFileSync(join(folder, 'original.png'), 'x')
    writeFileSync(join(tmp, 'new.upload'), 'x')
    // A sweep that began a minute from now finds all three older than itself...
    const startedAt = new Date(Date.now() + 60_000)
    const report = await sweepUploadLeftovers({
      db,
      store: createLocalFileStore(root),
      tmpDir: tmp,
      logger: pino({ level: 'silent' }),
      startedAt,
    })
    expect(report.temporaryFiles.sort()).toEqual(['new.upload', 'old.upload'])
    expect(report.storedFiles).toEqual([`films/de/${'de'.padEnd(64, 'f')}/original.png`])
    // ...while one that began a minute ago leaves a file written since alone.
    const later = new Date(Date.now() - 60_000)
    writeFileSync(join(tmp, 'fresh.upload'), 'x')
    const second = await sweepUploadLeftovers({
      db,
      store: createLocalFileStore(root),
      tmpDir: tmp,
      logger: pino({ level: 'silent' }),
      startedAt: later,
    })
    expect(second.temporaryFiles).toEqual([])
    expect(filesUnder(tmp)).toEqual([join(tmp, 'fresh.upload')])
    rmSync(root, { recursive: true, force: true })
  })
})

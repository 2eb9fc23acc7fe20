// The export's reading and writing on worker threads (server/exports/export-row-pool.ts) against
// the same rows written in one thread: the split must change nothing but the order of readings.
import { Writable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Db } from '../../server/db/knex'
import { createDb } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { toResultsColumns } from '../../server/db/reading-results-columns'
import { openMeasurementRowStream } from '../../server/exports/export-rows'
import {
  closeExportPool,
  exportWorkersFree,
  openCsvRecordStreamInWorkers,
} from '../../server/exports/export-row-pool'
import { writeCsv } from '../../server/exports/write-table'
import { prepareMeasurementExport, writeMeasurementExport } from '../../server/services/exports'
import type { Actor } from '../../server/services/audit'
import { phantomGroundTruth } from '../../server/phantom/generate-phantom'
import { computeMeasurements } from '../../shared/measurement/index'
import request from 'supertest'
import type { Express } from 'express'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createTestUser, type TestUser } from '../support/test-app'
import { insertTestFilm, insertTestPatient, insertTestVisit } from '../support/fixtures'

const FILMS = 24
/** Enough rows (3 000) that each worker is still sending when a download is cut short. */
const READINGS_PER_FILM = 25
/** Segments of a lumbar-alignment reading of the phantom: five output rows per reading. */
const SEGMENT_ROWS = 5

let db: Db
let actor: Actor
let app: Express
let surgeon: TestUser

/** A sink that keeps every byte (and, like a socket, makes the writer wait now and then). */
function collector(): Writable & { text: () => string } {
  const chunks: Buffer[] = []
  const sink = new Writable({
    highWaterMark: 4096,
    write(chunk: Buffer, _encoding, done) {
      chunks.push(chunk)
      setImmediate(done)
    },
  }) as Writable & { text: () => string }
  sink.text = () => Buffer.concat(chunks).toString('utf8')
  return sink
}

/** A download that takes its first chunk and then stops reading (a stalled client). */
function stalledDownload(): Writable {
  return new Writable({
    highWaterMark: 1024,
    write() {},
  })
}

/** Waits (at most five seconds) until `condition` holds. */
async function until(condition: () => boolean): Promise<void> {
  for (let attempt = 0; attempt < 100 && !condition(); attempt += 1) {
    await new Promise((resolve) => setTimeout(resolve, 50))
  }
}

/** The data records of a CSV, sorted: the same multiset whatever order the readings came in. */
const sortedRecords = (csv: string) => csv.trimEnd().split('\n').slice(1).sort()

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  const built = buildTestApp(db)
  app = built.app
  surgeon = await createTestUser(db, built.config, 'surgeon')
  const userId = surgeon.id
  actor = {
    user: { id: userId, email: surgeon.email, displayName: 'Test surgeon', role: 'surgeon' },
    ip: null,
  }
  const truth = phantomGroundTruth({})
  const measurements = computeMeasurements(
    truth.landmarks as Parameters<typeof computeMeasurements>[0],
  )
  const results = toResultsColumns({
    measurements,
    uncertainty: null,
    motion: null,
    subsidence: null,
    subsidenceBaselineReadingId: null,
  })
  for (let film = 0; film < FILMS; film += 1) {
    const patientId = await insertTestPatient(db, userId)
    const visitId = await insertTestVisit(db, patientId, userId)
    const imageId = await insertTestFilm(db, visitId, userId)
    await db(TABLES.readings).insert(
      Array.from({ length: READINGS_PER_FILM }, () => ({
        image_id: imageId,
        rater_id: userId,
        template: 'lumbar-alignment',
        template_options: '{}',
        landmarks: JSON.stringify(truth.landmarks),
        calibration: JSON.stringify({ mmPerPixel: [0.5, 0.5], source: 'dicom-pixel-spacing' }),
        ...results,
        engine_version: 'test',
        status: 'submitted',
      })),
    )
  }
}, 60_000)

afterAll(async () => {
  await closeExportPool()
  await db.destroy()
})

describe('an export read on worker threads', () => {
  it('writes the very records the single-thread writer gives, header and all, in shares of the films', async () => {
    const prepared = await prepareMeasurementExport(db, actor, { identified: true })
    const headers = prepared.columns.map((column) => column.header)
    const inProcess = collector()
    await writeCsv(
      {
        name: 'Measurements',
        headers,
        rows: await openMeasurementRowStream(db, prepared.filter, prepared.columns),
      },
      inProcess,
    )
    const expected = inProcess.text()
    expect(sortedRecords(expected)).toHaveLength(FILMS * READINGS_PER_FILM * SEGMENT_ROWS)

    // The route's path: one share per core, header and byte-order mark written here.
    const routed = collector()
    const rows = await writeMeasurementExport(db, actor, prepared, 'csv', routed)
    expect(rows).toBe(FILMS * READINGS_PER_FILM * SEGMENT_ROWS)
    expect(routed.text().split('\n')[0]).toBe(expected.split('\n')[0])
    expect(sortedRecords(routed.text())).toEqual(sortedRecords(expected))

    // Three shares (more than this machine may have cores): still every record exactly once.
    const threeShares = collector()
    let counted = 0
    const records = openCsvRecordStreamInWorkers(
      db,
      prepared.filter,
      true,
      (count) => (counted += count),
      3,
    )
    await pipeline(records, threeShares)
    expect(counted).toBe(FILMS * READINGS_PER_FILM * SEGMENT_ROWS)
    expect(`${expected.split('\n')[0]}\n${threeShares.text()}`.split('\n').slice(1).sort()).toEqual(
      [...sortedRecords(expected), ''].sort(),
    )
  })

  it('keeps the rows of each reading together when three shares interleave', async () => {
    const prepared = await prepareMeasurementExport(db, actor, {})
    const sink = collector()
    await pipeline(
      openCsvRecordStreamInWorkers(db, prepared.filter, false, () => {}, 3),
      sink,
    )
    const readingColumn = prepared.columns.findIndex((column) => column.header === 'reading_id')
    // No cell of these invented rows holds a comma or a quote, so a record splits on commas.
    const records = sink
      .text()
      .trimEnd()
      .split('\n')
      .map((record) => record.split(','))
    const readingIds = records.map((record) => record[readingColumn])
    const runs = readingIds.filter((id, index) => id !== readingIds[index - 1])
    expect(runs.length).toBe(FILMS * READINGS_PER_FILM)
    expect(new Set(runs).size).toBe(runs.length)
  })

  it('stops its queries when the download is cut short, audits it, and serves the next one', async () => {
    const prepared = await prepareMeasurementExport(db, actor, {})
    let received = 0
    const cutShort = new Writable({
      highWaterMark: 1024,
      write(chunk: Buffer, _encoding, done) {
        received += chunk.length
        if (received > 2048) cutShort.destroy()
        else done()
      },
    })
    await expect(writeMeasurementExport(db, actor, prepared, 'csv', cutShort)).rejects.toThrow()
    const audited = await db(TABLES.auditEvents).orderBy('id', 'desc').first()
    expect(audited.summary).toMatch(/stopped before the end/)
    // No export statement left running in MariaDB (bounded wait for the workers to stop): the
    // worker closes its connection, which ends the statement at once; at this size a statement
    // read to its end would be gone soon too, so this shows nothing was left behind.
    const running = async () =>
      (
        await db('information_schema.processlist')
          .whereRaw('info LIKE ? AND id <> CONNECTION_ID()', ['%max_statement_time%FOR select%'])
          .count({ n: '*' })
          .first()
      )?.n
    for (let attempt = 0; attempt < 50 && Number(await running()) > 0; attempt += 1) {
      await new Promise((resolve) => setTimeout(resolve, 100))
    }
    expect(Number(await running())).toBe(0)
    const next = collector()
    expect(await writeMeasurementExport(db, actor, prepared, 'csv', next)).toBe(
      FILMS * READINGS_PER_FILM * SEGMENT_ROWS,
    )
  })

  it('fails with the database’s own message when a worker cannot read', async () => {
    const { port } = db.client.config.connection as { port: number }
    const missing = createDb('endplate_no_such_database', { port })
    try {
      const records = openCsvRecordStreamInWorkers(missing, {}, false, () => {}, 1)
      await expect(
        new Promise((resolve, reject) => {
          records.on('error', reject)
          records.on('end', resolve)
          records.resume()
        }),
      ).rejects.toThrow(/endplate_no_such_database/)
    } finally {
      await missing.destroy()
    }
  })

  it('answers 503 with Retry-After while two stalled downloads hold every worker', async () => {
    const prepared = await prepareMeasurementExport(db, actor, {})
    const stalled = [stalledDownload(), stalledDownload()]
    const holding = stalled.map((download) =>
      writeMeasurementExport(db, actor, prepared, 'csv', download).catch(() => 0),
    )
    const refused = await request(app)
      .get('/api/exports/measurements.csv')
      .set('Cookie', surgeon.cookie)
    expect(refused.status).toBe(503)
    expect(refused.headers['retry-after']).toBe('30')
    expect(refused.body.error.code).toBe('busy')
    for (const download of stalled) download.destroy()
    await Promise.all(holding)
    await until(() => exportWorkersFree('csv'))
    const served = await request(app)
      .get('/api/exports/measurements.csv')
      .set('Cookie', surgeon.cookie)
    expect(served.status).toBe(200)
    expect(served.text.trimEnd().split('\n')).toHaveLength(
      1 + FILMS * READINGS_PER_FILM * SEGMENT_ROWS,
    )
  })
})

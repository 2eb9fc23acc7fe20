import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Db } from '../../server/db/knex'
import { config } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { findReading } from '../../server/db/readings'
import { parseJson } from '../../server/db/rows'
import { phantomGroundTruth } from '../../server/phantom/generate-phantom'
import { computeMeasurements, computeUncertainty } from '../../shared/measurement/index'
import type { ReadingResults } from '../../shared/types/readings'
import { createTestUser } from '../support/test-app'
import { insertTestFilm, insertTestPatient, insertTestVisit } from '../support/fixtures'
import { dropScratchSchemaDatabase, openScratchSchemaDatabase } from '../support/test-db'

// The migration that stores a reading's intervals apart from its other results: rows written
// before it must read back whole after it, and its `down` must give the old rows back unchanged.
const MIGRATION = '20261219090000_store_reading_uncertainty_apart.ts'
let db: Db

const document = phantomGroundTruth({}).landmarks as Parameters<typeof computeMeasurements>[0]
const withIntervals: ReadingResults = {
  measurements: computeMeasurements(document),
  uncertainty: computeUncertainty(document),
  motion: null,
  subsidence: null,
  subsidenceBaselineReadingId: null,
}
const withoutIntervals: ReadingResults = { ...withIntervals, uncertainty: null }

async function insertOldStyleReading(imageId: number, raterId: number, results: ReadingResults) {
  const [id] = await db(TABLES.readings).insert({
    image_id: imageId,
    rater_id: raterId,
    template: 'lumbar-alignment',
    template_options: '{}',
    landmarks: JSON.stringify(document),
    calibration: JSON.stringify({ mmPerPixel: [0.5, 0.5], source: 'dicom-pixel-spacing' }),
    results: JSON.stringify(results),
    engine_version: 'migration-test',
    status: 'submitted',
  })
  return id as number
}

async function storedColumns(id: number) {
  const row = await db(TABLES.readings).where({ id }).first('results', 'results_uncertainty')
  return {
    results: parseJson<Record<string, unknown>>(row.results)!,
    uncertainty: parseJson(row.results_uncertainty),
  }
}

beforeAll(async () => {
  db = await openScratchSchemaDatabase('uncertainty_apart')
  await db.migrate.down({ name: MIGRATION })
})
afterAll(() => dropScratchSchemaDatabase(db))

describe('storing the intervals apart (migration)', () => {
  it('splits existing readings, reads them back whole, and its down joins them again', async () => {
    const rater = await createTestUser(db, config, 'fellow')
    const patientId = await insertTestPatient(db, rater.id)
    const visitId = await insertTestVisit(db, patientId, rater.id)
    const imageId = await insertTestFilm(db, visitId, rater.id)
    const measured = await insertOldStyleReading(imageId, rater.id, withIntervals)
    const uncalibrated = await insertOldStyleReading(imageId, rater.id, withoutIntervals)

    await db.migrate.up({ name: MIGRATION })
    const split = await storedColumns(measured)
    expect(split.results).not.toHaveProperty('uncertainty')
    expect(split.results.measurements).toEqual(withIntervals.measurements)
    expect(split.uncertainty).toEqual(withIntervals.uncertainty)
    expect((await storedColumns(uncalibrated)).uncertainty).toBeNull()
    expect((await findReading(db, measured))!.results).toEqual(withIntervals)
    expect((await findReading(db, uncalibrated))!.results).toEqual(withoutIntervals)

    await db.migrate.down({ name: MIGRATION })
    const [joined] = (await db(TABLES.readings)
      .where({ id: measured })
      .select('results')) as Array<{
      results: string
    }>
    expect(parseJson(joined!.results)).toEqual(withIntervals)
    const [nullJoined] = (await db(TABLES.readings)
      .where({ id: uncalibrated })
      .select('results')) as Array<{ results: string }>
    expect(parseJson(nullJoined!.results)).toEqual(withoutIntervals)
    await db.migrate.up({ name: MIGRATION })
  })
})

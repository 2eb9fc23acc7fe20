import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { insertVisit } from '../../server/db/visits'
import type { TemplateOptions } from '../../shared/readings/templates'
import type { ReadingTemplate, Role, VisitKind } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import type { PatientTrends, TrendSeries } from '../../shared/types/plans'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { readPhantomAt, uploadPhantomFilm } from '../support/api-films'

type Points = Record<string, PixelPoint>
type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let patientId: number
let visits: Record<VisitKind, number>
let preOpFilm: Phantom
let postOpFilm: Phantom

/**
 * Taillard slip by hand (Butt & Saifuddin 2005, Clin Radiol 60:533): the offset of U.pi from
 * W.ps along W's superior endplate, as a percentage of that endplate's depth.
 */
function taillardPercent(points: Points): number {
  const [upx, upy] = points['L5.pi'] as PixelPoint
  const [psx, psy] = points['S1.ps'] as PixelPoint
  const [asx, asy] = points['S1.as'] as PixelPoint
  const depth = Math.hypot(asx - psx, asy - psy)
  return (100 * ((upx - psx) * (asx - psx) + (upy - psy) * (asy - psy))) / depth / depth
}

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-trends-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  // Invented course: a 30 % slip at L5-S1 before surgery, 8 % after reduction.
  preOpFilm = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 30 } } })
  postOpFilm = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 8 } } })
}, 60_000)
afterAll(async () => {
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})
beforeEach(async () => {
  await truncateAll(db)
  for (const entry of readdirSync(uploadDir))
    rmSync(join(uploadDir, entry), { recursive: true, force: true })
  users = await createUsersForEveryRole(db, config)
  patientId = await insertTestPatient(db, users.fellow.id)
  const visit = (visitDate: string, kind: VisitKind, monthsSinceSurgery: number | null) =>
    insertVisit(db, {
      patientId,
      visitDate,
      kind,
      monthsSinceSurgery,
      indication: null,
      createdBy: users.fellow.id,
    })
  // Inserted out of order: the trends must come back in time order.
  const followUp = await visit('2026-09-01', 'follow-up', 6)
  visits = {
    'pre-op': await visit('2026-01-10', 'pre-op', null),
    'post-op': await visit('2026-03-01', 'post-op', null),
    'follow-up': followUp,
  }
  await insertStudyWith(db, users.researcher.id, [patientId])
})

const getTrends = (who: TestUser = users.surgeon) =>
  request(app).get(`/api/patients/${patientId}/trends`).set('Cookie', who.cookie)
const seriesOf = (trends: PatientTrends, key: string) =>
  trends.series.find((s) => s.key === key) as TrendSeries

describe('GET /api/patients/:id/trends', () => {
  it('gives each visit in time order with its values, preferring submitted readings over drafts', async () => {
    const preOpImage = await uploadFilm(preOpFilm, visits['pre-op'])
    const submitted = await readAt(preOpFilm, preOpImage, 'slip-grade', { segment: 'L5-S1' }, true)
    // A later draft at the same visit does not replace the submitted value.
    await readAt(postOpFilm, preOpImage, 'slip-grade', { segment: 'L5-S1' }, false)
    const postOpImage = await uploadFilm(postOpFilm, visits['post-op'])
    const draft = await readAt(postOpFilm, postOpImage, 'slip-grade', { segment: 'L5-S1' }, false)
    await db(TABLES.planSegments).insert({
      patient_id: patientId,
      segment: 'L5-S1',
      treatment: 'interbody-fusion',
      updated_by: users.surgeon.id,
    })

    const res = await getTrends()
    expect(res.status).toBe(200)
    const trends = res.body as PatientTrends
    expect(trends.visits.map((v) => [v.visitKind, v.visitDate, v.sequence])).toEqual([
      ['pre-op', '2026-01-10', 1],
      ['post-op', '2026-03-01', 2],
      ['follow-up', '2026-09-01', 3],
    ])
    const slip = seriesOf(trends, 'slip-percent:L5-S1')
    expect(slip.unit).toBe('%')
    expect(slip.points).toHaveLength(2)
    expect(slip.points[0]).toMatchObject({
      visitId: visits['pre-op'],
      readingId: submitted.id,
      isDraft: false,
      status: 'submitted',
    })
    expect(slip.points[0]?.value).toBeCloseTo(taillardPercent(submitted.points), 1)
    expect(slip.points[1]).toMatchObject({
      visitId: visits['post-op'],
      readingId: draft.id,
      isDraft: true,
      status: 'draft',
    })
    expect(slip.points[1]?.value).toBeCloseTo(taillardPercent(draft.points), 1)

    // The treated segment gets its lordosis and disc height; untreated ones do not.
    const height = seriesOf(trends, 'disc-height:L5-S1')
    expect(height.unit).toBe('mm')
    expect(height.points[0]?.calibrationSource).toBe('dicom-pixel-spacing')
    expect(seriesOf(trends, 'segmental-lordosis:L5-S1').unit).toBe('°')
    expect(trends.series.find((s) => s.key === 'segmental-lordosis:L4-L5')).toBeUndefined()
    // Slip-grade readings give no L1–S1 lordosis: the series is there, and empty.
    expect(seriesOf(trends, 'lumbar-lordosis').points).toEqual([])
  })

  it('takes L1–S1 lordosis from a lumbar-alignment reading', async () => {
    const image = await uploadFilm(preOpFilm, visits['pre-op'])
    const { points } = await readAt(preOpFilm, image, 'lumbar-alignment', {}, true)
    const trends = (await getTrends()).body as PatientTrends
    // Cobb angle between L1's and S1's superior endplates (Polly et al. 1996).
    const angle = (p: PixelPoint, a: PixelPoint) => Math.atan2(a[1] - p[1], a[0] - p[0])
    const l1 = angle(points['L1.ps'] as PixelPoint, points['L1.as'] as PixelPoint)
    const s1 = angle(points['S1.ps'] as PixelPoint, points['S1.as'] as PixelPoint)
    const point = seriesOf(trends, 'lumbar-lordosis').points[0]
    expect(Math.abs(point?.value ?? NaN)).toBeCloseTo((Math.abs(l1 - s1) * 180) / Math.PI, 1)
  })

  it('gives researchers sequence numbers and months since surgery, never dates', async () => {
    const res = await getTrends(users.researcher)
    expect(res.status).toBe(200)
    expect(res.body.visits).toEqual([
      {
        visitId: visits['pre-op'],
        visitKind: 'pre-op',
        monthsSinceSurgery: null,
        visitDate: null,
        sequence: 1,
      },
      {
        visitId: visits['post-op'],
        visitKind: 'post-op',
        monthsSinceSurgery: null,
        visitDate: null,
        sequence: 2,
      },
      {
        visitId: visits['follow-up'],
        visitKind: 'follow-up',
        monthsSinceSurgery: 6,
        visitDate: null,
        sequence: 3,
      },
    ])
    expect(JSON.stringify(res.body)).not.toMatch(/2026-/)
  })

  it("refuses the administrator and hides patients outside the researcher's studies", async () => {
    expect((await getTrends(users.admin)).status).toBe(403)
    const other = await insertTestPatient(db, users.fellow.id)
    const res = await request(app)
      .get(`/api/patients/${other}/trends`)
      .set('Cookie', users.researcher.cookie)
    expect(res.status).toBe(404)
  })
})

const uploadFilm = (film: Phantom, visitId: number) =>
  uploadPhantomFilm(app, users.fellow.cookie, visitId, film)
const readAt = (
  film: Phantom,
  imageId: number,
  template: ReadingTemplate,
  options: TemplateOptions,
  submit: boolean,
) => readPhantomAt(app, users.fellow.cookie, film, imageId, template, options, submit)

import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { DEMO_PATIENTS, DEMO_STUDY, DEMO_USERS } from '../../server/demo/demo-data'
import { templateLandmarks } from '../../shared/readings/templates'
import type { PixelPoint } from '../../shared/types/landmarks'
import type { Assignment } from '../../shared/types/rounds'
import { openTestDb, seedDemo, truncateAll } from '../support/test-db'
import {
  launchBrowser,
  screenshotPath,
  signInThroughForm,
  startAppServer,
} from '../support/browser'
import { buildTestApp, createTestUser, type TestUser } from '../support/test-app'
import { smallPhantomFiles } from '../support/phantom-files'
import { uploadPhantomFilm } from '../support/api-films'

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }
let roundId: number
let firstRater: TestUser
const studyPatients = DEMO_PATIENTS.filter((patient) => patient.inStudy)
const OPTIONS = { segment: 'L5-S1' as const }
const SLIPS_PERCENT = [8, 18, 30, 45]

/** A rater's own small, fixed misplacement of every landmark (px), so the raters differ. */
function misplaced(points: Record<string, PixelPoint>, rater: number, film: number) {
  return Object.fromEntries(
    Object.entries(points).map(([name, [x, y]], index) => [
      name,
      [x + ((rater * 3 + film + index) % 5) - 2, y + ((rater + 2 * film + index) % 3) - 1],
    ]),
  )
}

/** Reads the rater's due assignments at the phantom's landmarks (misplaced), leaving `skip`. */
async function readAssignments(
  app: Express,
  rater: TestUser,
  raterIndex: number,
  truthByImage: Map<number, Record<string, PixelPoint>>,
  blindByImage: Map<string, number>,
  skip = 0,
): Promise<void> {
  const listed = await request(app).get('/api/assignments?status=due').set('Cookie', rater.cookie)
  expect(listed.status).toBe(200)
  const due = (listed.body.items as Assignment[]).slice(skip)
  for (const assignment of due) {
    const started = await request(app)
      .post(`/api/assignments/${assignment.id}/start`)
      .set('Cookie', rater.cookie)
    expect(started.status).toBe(201)
    const reading = await request(app)
      .get(`/api/readings/${started.body.readingId}`)
      .set('Cookie', rater.cookie)
    const imageId = reading.body.imageId as number
    blindByImage.set(assignment.blindCode, imageId)
    const points = misplaced(truthByImage.get(imageId)!, raterIndex, assignment.position)
    const saved = await request(app)
      .patch(`/api/readings/${reading.body.id}`)
      .set('Cookie', rater.cookie)
      .send({ points, version: reading.body.version })
    expect(saved.status).toBe(200)
    const submitted = await request(app)
      .post(`/api/readings/${reading.body.id}/submit`)
      .set('Cookie', rater.cookie)
      .send({ version: saved.body.version })
    expect(submitted.status).toBe(200)
  }
}

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  await seedDemo(db)
  const { app, config } = buildTestApp(db)
  const surgeon = await createTestUser(db, config, 'surgeon', 'round-surgeon@test.example')
  firstRater = await createTestUser(db, config, 'fellow', 'round-fellow-1@test.example')
  const secondRater = await createTestUser(db, config, 'fellow', 'round-fellow-2@test.example')
  const study = await db(TABLES.studies).where({ name: DEMO_STUDY.name }).first()

  // Four films of slips of different size on the study's patients' first visits.
  const names = templateLandmarks('slip-grade', OPTIONS).map((spec) => spec.name)
  const truthByImage = new Map<number, Record<string, PixelPoint>>()
  for (const [index, slipPercent] of SLIPS_PERCENT.entries()) {
    const patient = studyPatients[index % studyPatients.length]!
    const row = await db(TABLES.patients).where({ record_number: patient.recordNumber }).first()
    const visit = await db(TABLES.visits)
      .where({ patient_id: row.id })
      .orderBy('visit_date')
      .first()
    const film = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent } } })
    const imageId = await uploadPhantomFilm(app, firstRater.cookie, visit.id, film)
    const truth = film.film.landmarks.points as Record<string, PixelPoint>
    truthByImage.set(
      imageId,
      Object.fromEntries(names.filter((name) => truth[name]).map((name) => [name, truth[name]!])),
    )
  }

  const created = await request(app)
    .post(`/api/studies/${study.id}/rounds`)
    .set('Cookie', surgeon.cookie)
    .send({
      name: 'Slip grade agreement',
      kind: 'inter',
      template: 'slip-grade',
      templateOptions: OPTIONS,
      options: { showResultsBeforeSubmit: false },
      imageIds: [...truthByImage.keys()],
      raterIds: [firstRater.id, secondRater.id],
      seed: 'browser-test',
    })
  if (created.status !== 201) throw new Error(`The round was not created: ${created.text}`)
  roundId = created.body.id
  const blindByImage = new Map<string, number>()
  // The second rater reads everything; the first leaves one film, opened in the browser below.
  await readAssignments(app, secondRater, 1, truthByImage, blindByImage)
  await readAssignments(app, firstRater, 0, truthByImage, blindByImage, 1)

  server = await startAppServer(db)
  browser = await launchBrowser()
}, 180_000)

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

/** Everything that would name a study patient or date their visits. */
async function identifyingValues(): Promise<string[]> {
  const values = studyPatients.flatMap((patient) => [
    patient.familyName,
    patient.givenName,
    patient.recordNumber,
    patient.birthDate,
  ])
  const visits = await db(TABLES.visits).select('visit_date')
  return [
    ...values,
    ...visits.map((visit) => new Date(visit.visit_date).toISOString().slice(0, 10)),
  ]
}

describe('Re-reading rounds in Chromium', () => {
  it('opens a fellow’s assignment blinded: blind code, no patient, no dates, no results yet', async () => {
    const page: Page = await browser.newPage()
    await signInThroughForm(browser, page, server.url, firstRater)
    const due = page.getByTestId('assignments-due')
    await page.getByRole('heading', { name: 'Blinded readings to do' }).waitFor()
    await due.getByRole('button', { name: 'Start' }).click()
    await page.getByTestId('blinded-note').waitFor()
    await page.getByText(/^Blind code /).waitFor()
    await page.getByTestId('results-hidden').waitFor()
    await page.getByRole('button', { name: 'Submit to the round' }).waitFor()
    const html = await page.content()
    for (const value of await identifyingValues()) expect(html).not.toContain(value)
    // No way out to the clinical record from a blinded reading.
    expect(await page.getByRole('link', { name: 'Back to the patient' }).count()).toBe(0)
    expect(await page.getByRole('button', { name: /Compare|Print/ }).count()).toBe(0)
    await page.screenshot({ path: screenshotPath('round-assignment-blinded') })
    await page.close()
  })

  it('shows a researcher the round from their worklist, its results and a CSV download', async () => {
    const page = await browser.newPage()
    const researcher = DEMO_USERS.find((user) => user.role === 'researcher')!
    await signInThroughForm(browser, page, server.url, researcher)
    await page.getByRole('heading', { name: 'Your studies' }).waitFor()
    await page.getByRole('link', { name: 'Slip grade agreement' }).waitFor()
    await page.screenshot({ path: screenshotPath('round-researcher-worklist'), fullPage: true })

    await page.getByRole('link', { name: 'Slip grade agreement' }).click()
    await page.getByRole('heading', { name: 'Slip grade agreement: results' }).waitFor()
    expect(new URL(page.url()).pathname).toBe(`/rounds/${roundId}/results`)
    const measures = page.getByTestId('round-measure')
    await measures.first().waitFor()
    // Three of the four films have both raters' readings.
    await page.getByText('n = 3 films · k = 2').first().waitFor()
    await page.getByTestId('icc-main').first().waitFor()
    await page.getByRole('button', { name: 'Bland–Altman plots' }).first().click()
    await page.locator('.agreement-plot canvas').first().waitFor()
    const html = await page.content()
    for (const value of await identifyingValues()) expect(html).not.toContain(value)
    await page.screenshot({ path: screenshotPath('round-results'), fullPage: true })

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Download CSV' }).click(),
    ])
    const csv = readFileSync((await download.path())!, 'utf8')
    expect(download.suggestedFilename()).toMatch(/\.csv$/)
    expect(csv.split('\n').length).toBeGreaterThan(2)
    for (const value of await identifyingValues()) expect(csv).not.toContain(value)
    await page.getByText(/Saved round-\d+-results\.csv/).waitFor()
    await page.close()
  })
})

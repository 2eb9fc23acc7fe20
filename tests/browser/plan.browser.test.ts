import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { SESSION_COOKIE, signSessionToken, tokenSettingsOf } from '../../server/auth/session-token'
import { DEMO_USERS } from '../../server/demo/demo-data'
import { templateLandmarks, type TemplateOptions } from '../../shared/readings/templates'
import type { ReadingTemplate } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import { openTestDb, seedDemo, truncateAll } from '../support/test-db'
import { testConfig } from '../support/test-app'
import {
  launchBrowser,
  screenshotPath,
  sourceTagsShown,
  openPatientsFromMenu,
  signInThroughForm,
  startAppServer,
} from '../support/browser'
import { smallPhantomFiles } from '../support/phantom-files'

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }
let fellowCookie: string
let hybridId: number

const surgeon = DEMO_USERS.find((user) => user.role === 'surgeon')!

async function upload(visitId: number, film: Phantom): Promise<number> {
  const res = await request(server.url)
    .post(`/api/visits/${visitId}/images`)
    .set('Cookie', fellowCookie)
    .set('Origin', server.url)
    .field('view', 'lateral-neutral')
    .field('confirmPatientMismatch', 'true')
    .attach('file', film.dicom, 'neutral.dcm')
  if (res.status !== 201) throw new Error(`upload failed: ${JSON.stringify(res.body)}`)
  return res.body[0].id as number
}

/** A reading at the phantom's exact landmarks, made by the demo fellow through the API. */
async function read(
  imageId: number,
  film: Phantom,
  template: ReadingTemplate,
  options: TemplateOptions,
  submit: boolean,
) {
  const truth = film.film.landmarks.points as Record<string, PixelPoint>
  const names = templateLandmarks(template, options).map((spec) => spec.name)
  const points = Object.fromEntries(names.map((name) => [name, truth[name]]))
  const created = await request(server.url)
    .post(`/api/images/${imageId}/readings`)
    .set('Cookie', fellowCookie)
    .set('Origin', server.url)
    .send({ template, options, points })
  if (created.status !== 201) throw new Error(`reading failed: ${JSON.stringify(created.body)}`)
  if (!submit) return
  const submitted = await request(server.url)
    .post(`/api/readings/${created.body.id}/submit`)
    .set('Cookie', fellowCookie)
    .set('Origin', server.url)
    .send({ version: created.body.version })
  if (submitted.status !== 200) throw new Error(`submit failed: ${JSON.stringify(submitted.body)}`)
}

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  // The demo clinic without its films; the hybrid patient comes with the demo plan.
  await seedDemo(db)
  server = await startAppServer(db)
  browser = await launchBrowser()
  const config = testConfig()
  const fellow = await db(TABLES.users).where({ role: 'fellow' }).first()
  fellowCookie = `${SESSION_COOKIE}=${signSessionToken(fellow.id, 'fellow', tokenSettingsOf(config))}`
  const hybrid = await db(TABLES.patients).where({ record_number: 'EPD-103977' }).first()
  hybridId = hybrid.id
  const visits = await db(TABLES.visits).where({ patient_id: hybridId }).orderBy('visit_date')
  // Invented films: a 14 % slip at L5-S1 before surgery, reduced to 5 % after, 6 % at one year.
  const preOp = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 14 } } })
  const postOp = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 5 } } })
  const oneYear = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 6 } } })
  await read(await upload(visits[0].id, preOp), preOp, 'lumbar-alignment', {}, true)
  await read(await upload(visits[1].id, postOp), postOp, 'lumbar-alignment', {}, true)
  await read(await upload(visits[2].id, oneYear), oneYear, 'lumbar-alignment', {}, false)
}, 120_000)

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

async function signInAsSurgeon(page: Page) {
  await signInThroughForm(browser, page, server.url, surgeon)
  await openPatientsFromMenu(page)
}

async function openHybridAsSurgeon(page: Page) {
  await signInAsSurgeon(page)
  await page.locator('.patients-table').getByText('Marchetti-Vance, Sofia').click()
  await page.getByRole('heading', { name: 'Marchetti-Vance, Sofia' }).waitFor()
}

describe('The plan and trends on the Patient screen in Chromium', () => {
  it('shows the plan with its checks, saves a changed treatment, and draws the trends', async () => {
    const page = await browser.newPage()
    await openHybridAsSurgeon(page)
    const rows = page.locator('[data-segment]')
    await expect.poll(() => rows.count()).toBe(5)
    await page.getByText('Flags are decision support, not a decision.').waitFor()
    const l34 = page.locator('[data-segment="L3-L4"]')
    // The demo plan's disc replacement at L3-L4: the measured slip check is answered from the reading.
    await expect
      .poll(() => l34.locator('[data-check="slip-grade-ii-or-more"]').getAttribute('data-state'))
      .toBe('clear')
    await expect
      .poll(() =>
        l34.locator('[data-check="dynamic-translation-over-5mm"]').getAttribute('data-state'),
      )
      .toBe('unknown')
    await expect
      .poll(() => page.locator('[data-series] canvas').count(), { timeout: 10_000 })
      .toBeGreaterThanOrEqual(3)
    await page.screenshot({ path: screenshotPath('plan-surgeon'), fullPage: true })

    // Plan a disc replacement at the isthmic L5-S1 level: the recorded pars defects are flagged.
    const l5s1 = page.locator('[data-segment="L5-S1"]')
    await l5s1.getByLabel('Planned treatment at L5-S1').click()
    await page.getByRole('option', { name: 'Disc replacement' }).click()
    await l5s1.getByRole('button', { name: 'Save plan at L5-S1' }).click()
    await page.getByText('Plan saved at L5-S1').waitFor()
    await expect
      .poll(() => l5s1.locator('[data-check="pars-defect"]').getAttribute('data-state'))
      .toBe('flagged')
    const row = await db(TABLES.planSegments)
      .where({ patient_id: hybridId, segment: 'L5-S1' })
      .first()
    expect(row).toMatchObject({ treatment: 'disc-replacement', version: 2 })
    await page.screenshot({ path: screenshotPath('plan-flagged'), fullPage: true })
    // Checks, their tooltips, the lordosis block and the implant rows: citations in words only.
    expect(await sourceTagsShown(page, 'main')).toEqual([])
    await page
      .getByRole('region', { name: 'Plan' })
      .screenshot({ path: screenshotPath('plan-table') })
    await page
      .getByRole('region', { name: 'Trends across visits' })
      .screenshot({ path: screenshotPath('plan-trends') })
    await page.close()
  })

  it('says so and reloads when someone else saved the segment first (409)', async () => {
    const page = await browser.newPage()
    // Still signed in from the first test (one browser profile).
    await page.goto(`${server.url}/patients/${hybridId}`)
    await page.getByRole('heading', { name: 'Marchetti-Vance, Sofia' }).waitFor()
    const l44 = page.locator('[data-segment="L4-L5"]')
    await l44.waitFor()
    // Another surgeon's save lands after this page read the plan.
    await db(TABLES.planSegments)
      .where({ patient_id: hybridId, segment: 'L4-L5' })
      .update({ treatment: 'interbody-fusion', version: 9 })
    await l44.getByLabel('Facet joint degeneration at L4-L5').check()
    await l44.getByRole('button', { name: 'Save plan at L4-L5' }).click()
    await page.getByTestId('plan-conflict').waitFor()
    await expect
      .poll(() => l44.getByLabel('Planned treatment at L4-L5').textContent())
      .toContain('Interbody fusion')
    const row = await db(TABLES.planSegments)
      .where({ patient_id: hybridId, segment: 'L4-L5' })
      .first()
    expect(row).toMatchObject({ facet_degeneration: 0, version: 9 })
    await page.screenshot({ path: screenshotPath('plan-conflict') })
    await page.close()
  })

  it('shows a fellow the plan read-only, and an empty trends state for a patient without readings', async () => {
    await browser.clearCookies()
    const [name, value] = fellowCookie.split('=') as [string, string]
    await browser.addCookies([{ name, value, url: server.url }])
    const page = await browser.newPage()
    await page.goto(`${server.url}/patients/${hybridId}`)
    await page.getByRole('heading', { name: 'Marchetti-Vance, Sofia' }).waitFor()
    await page.getByText('Only surgeons change the plan.').waitFor()
    await expect.poll(() => page.locator('[data-segment]').count()).toBe(5)
    expect(await page.getByRole('button', { name: /^Save plan at/ }).count()).toBe(0)
    expect(await page.getByLabel('Pars defect, left at L5-S1').isDisabled()).toBe(true)
    await page
      .getByRole('region', { name: 'Plan' })
      .screenshot({ path: screenshotPath('plan-fellow') })

    const other = await db(TABLES.patients).where({ record_number: 'EPD-104211' }).first()
    await page.goto(`${server.url}/patients/${other.id}`)
    await page.getByTestId('trends-empty').waitFor()
    await page.screenshot({ path: screenshotPath('plan-empty-patient'), fullPage: true })
    await page.close()
  })
})

import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import { DEMO_PATIENTS, DEMO_STUDY, DEMO_USERS } from '../../server/demo/demo-data'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  launchBrowser,
  screenshotPath,
  signInThroughForm,
  startAppServer,
} from '../support/browser'
import { buildTestApp, createTestUser } from '../support/test-app'
import { smallPhantomFiles } from '../support/phantom-files'
import { readPhantomAt, uploadPhantomFilm } from '../support/api-films'

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }
const studyPatient = DEMO_PATIENTS.find((patient) => patient.inStudy)!

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  await db.seed.run()
  // One submitted reading on a study patient's film, so the export has a row to show.
  const { app, config } = buildTestApp(db)
  const fellow = await createTestUser(db, config, 'fellow', 'export-fellow@test.example')
  const patient = await db(TABLES.patients)
    .where({ record_number: studyPatient.recordNumber })
    .first()
  const visit = await db(TABLES.visits)
    .where({ patient_id: patient.id })
    .orderBy('visit_date')
    .first()
  const film = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 18 } } })
  const imageId = await uploadPhantomFilm(app, fellow.cookie, visit.id, film)
  await readPhantomAt(app, fellow.cookie, film, imageId, 'slip-grade', { segment: 'L5-S1' })
  server = await startAppServer(db)
  browser = await launchBrowser()
}, 120_000)

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

async function signIn(page: Page, role: 'surgeon' | 'researcher') {
  await signInThroughForm(
    browser,
    page,
    server.url,
    DEMO_USERS.find((candidate) => candidate.role === role)!,
  )
}

describe('Studies screen in Chromium', () => {
  it('shows a researcher their study with counts and downloads a de-identified CSV with progress', async () => {
    const page = await browser.newPage()
    await signIn(page, 'researcher')
    await page.getByRole('link', { name: 'Studies' }).click()
    await page.getByRole('heading', { name: 'Studies' }).waitFor()
    const row = page.locator('.studies-table tbody tr', { hasText: DEMO_STUDY.name })
    await row.waitFor()
    await expect.poll(() => row.locator('td').nth(2).innerText()).toBe('1')
    await page.locator('.studies-table .p-datatable-mask').waitFor({ state: 'detached' })
    await page.screenshot({ path: screenshotPath('studies-researcher'), fullPage: true })

    await row.click()
    await page.getByRole('heading', { name: DEMO_STUDY.name }).waitFor()
    await page.getByText(studyPatient.studyCode).waitFor()
    expect(await page.content()).not.toContain(studyPatient.familyName)
    await page.screenshot({ path: screenshotPath('study-researcher'), fullPage: true })

    // The status filter shows the plain status names, never the stored values.
    const statusChips = page
      .locator('#ex-status')
      .locator('xpath=ancestor::div[contains(@class,"p-multiselect")]')
    await expect.poll(() => statusChips.innerText()).toContain('Awaiting signature')
    expect(await statusChips.innerText()).toContain('Signed')
    expect(await statusChips.innerText()).not.toContain('submitted')

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Download CSV' }).click(),
    ])
    const csv = readFileSync((await download.path())!, 'utf8')
    expect(download.suggestedFilename()).toMatch(/^endplate-measurements-study-\d+\.csv$/)
    expect(csv).toContain('slip (%)')
    expect(csv).toContain(studyPatient.studyCode)
    for (const value of [
      studyPatient.familyName,
      studyPatient.givenName,
      studyPatient.recordNumber,
      studyPatient.birthDate,
    ]) {
      expect(csv).not.toContain(value)
    }
    await page.getByText(/Saved endplate-measurements-study-\d+\.csv/).waitFor()
    await page.screenshot({ path: screenshotPath('study-researcher-exported'), fullPage: true })
    await page.close()
  })

  it('lets a surgeon create a study, add a patient and a researcher', async () => {
    const page = await browser.newPage()
    await signIn(page, 'surgeon')
    await page.getByRole('link', { name: 'Studies' }).click()
    await page.getByRole('button', { name: 'New study' }).click()
    const dialog = page.getByRole('dialog', { name: 'New study' })
    await dialog.getByLabel('Name').fill('Hybrid construct two-year review')
    await dialog
      .getByLabel('Purpose (one line)')
      .fill('Alignment two years after hybrid constructs')
    await dialog.getByRole('button', { name: 'Create study' }).click()
    await page.getByRole('heading', { name: 'Hybrid construct two-year review' }).waitFor()

    await page.getByRole('button', { name: 'Add patients' }).click()
    const add = page.getByRole('dialog', { name: 'Add patients to the study' })
    await add.getByLabel('Find patients').fill(studyPatient.familyName)
    await add.getByText(studyPatient.recordNumber).click()
    await add.getByRole('button', { name: 'Add 1' }).click()
    await add.waitFor({ state: 'hidden' })
    await page.locator('.patients-table').getByText(studyPatient.familyName).waitFor()

    await page.getByRole('button', { name: 'Researchers' }).click()
    const members = page.getByRole('dialog', { name: 'Researchers in the study' })
    await members.locator('.p-multiselect').click()
    const researcher = DEMO_USERS.find((user) => user.role === 'researcher')!
    await page.getByRole('option', { name: researcher.displayName }).click()
    await page.keyboard.press('Escape')
    await members.getByRole('button', { name: 'Save members' }).click()
    await members.waitFor({ state: 'hidden' })
    await page.locator('.facts').getByText(researcher.displayName).waitFor()
    await page.screenshot({ path: screenshotPath('study-surgeon'), fullPage: true })

    const stored = await db(TABLES.studies)
      .where({ name: 'Hybrid construct two-year review' })
      .first()
    expect(stored.version).toBe(3)
    expect(await db(TABLES.studyPatients).where({ study_id: stored.id })).toHaveLength(1)
    expect(await db(TABLES.studyMembers).where({ study_id: stored.id })).toHaveLength(1)
    await page.close()
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import { DEMO_USERS } from '../../server/demo/demo-data'
import { openTestDb, seedDemo, truncateAll } from '../support/test-db'
import {
  launchBrowser,
  screenshotPath,
  openPatientsFromMenu,
  signInThroughForm,
  startAppServer,
} from '../support/browser'
import { smallPhantomFiles } from '../support/phantom-files'
import { insertTestFilm } from '../support/fixtures'

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  await seedDemo(db)
  server = await startAppServer(db)
  browser = await launchBrowser()
})

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

describe('Pixel review in Chromium', () => {
  it('lets a surgeon look at a PNG film and confirm no identity in its pixels', async () => {
    const { png } = await smallPhantomFiles({ seed: 9 })
    const page = await browser.newPage()
    const surgeon = DEMO_USERS.find((user) => user.role === 'surgeon')!
    await signInThroughForm(browser, page, server.url, surgeon)
    await openPatientsFromMenu(page)
    await page.locator('.patients-table').getByText('Halvorsen, Ingrid').click()
    await page.getByRole('heading', { name: 'Halvorsen, Ingrid' }).waitFor()
    await page
      .getByTestId('film-input')
      .setInputFiles([{ name: 'standing.png', mimeType: 'image/png', buffer: png }])
    await page.getByRole('button', { name: 'Upload films' }).click()

    // An ordinary image file makes no claim about burned-in text: held back until checked.
    const grid = page.getByRole('list', { name: 'Films of this visit' })
    await grid.getByText('Pixels not yet checked · held back from researchers').waitFor()
    await grid.getByRole('button', { name: 'Check pixels' }).click()
    const dialog = page.getByRole('dialog', { name: 'Check the pixels for identity' })
    await dialog.getByText(/makes no claim about burned-in text/).waitFor()
    await expect
      .poll(() =>
        dialog
          .locator('img')
          .evaluate((image) => (image as unknown as { naturalWidth: number }).naturalWidth),
      )
      .toBeGreaterThan(0)
    await page.screenshot({ path: screenshotPath('pixel-review-dialog') })
    await dialog.getByRole('button', { name: 'No identity in the pixels' }).click()
    await dialog.waitFor({ state: 'hidden' })

    await grid
      .getByText(new RegExp(`No identity in the pixels: confirmed by ${surgeon.displayName}`))
      .waitFor()
    await page.screenshot({ path: screenshotPath('pixel-review-cleared'), fullPage: true })
    const [film] = await db('images').select('burned_in_annotation', 'pixels_cleared_at')
    expect(film.burned_in_annotation).toBe('unknown')
    expect(film.pixels_cleared_at).not.toBeNull()
    await page.close()
  }, 60_000)

  it("tells a researcher how many films are held back, on the study and on the patient's visit", async () => {
    // A second film of the same visit that no clinician has checked (a row is enough: held back,
    // its files are never asked for).
    const visit = await db('images').first('visit_id', 'uploaded_by')
    await insertTestFilm(db, visit.visit_id, visit.uploaded_by, 'unknown')
    const { patient_id: patientId } = await db('visits').where({ id: visit.visit_id }).first()
    const { study_id: studyId } = await db('study_patients')
      .where({ patient_id: patientId })
      .first()
    const page = await browser.newPage()
    await signInThroughForm(
      browser,
      page,
      server.url,
      DEMO_USERS.find((user) => user.role === 'researcher')!,
    )
    await page.getByRole('heading', { name: 'Worklist' }).waitFor()
    await page.goto(`${server.url}/studies/${studyId}`)
    const note = page.getByTestId('held-back-films')
    await note
      .getByText('1 film held back until a clinician confirms it shows no identity in the pixels.')
      .waitFor()
    // PrimeVue's message fades in: wait until it is fully shown before the screenshot.
    await expect
      .poll(() =>
        note.evaluate((element) => {
          // Runs in the page; the test's own types have no DOM.
          const view = globalThis as unknown as {
            getComputedStyle(target: unknown): { opacity: string }
          }
          return view.getComputedStyle(element).opacity
        }),
      )
      .toBe('1')
    await page.screenshot({ path: screenshotPath('pixel-review-study-held-back') })
    await page.goto(`${server.url}/patients/${patientId}`)
    const grid = page.getByRole('list', { name: 'Films of this visit' })
    await expect.poll(() => grid.locator('img').count(), { timeout: 20_000 }).toBe(1)
    await page.getByTestId('held-back-films').waitFor()
    await page.screenshot({
      path: screenshotPath('pixel-review-patient-held-back'),
      fullPage: true,
    })
    await page.close()
  }, 60_000)
})

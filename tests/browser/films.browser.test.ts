import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import { DEMO_USERS } from '../../server/demo/demo-data'
import { openTestDb, truncateAll } from '../support/test-db'
import {
  launchBrowser,
  screenshotPath,
  openPatientsFromMenu,
  signInThroughForm,
  startAppServer,
} from '../support/browser'
import { smallPhantomFiles } from '../support/phantom-files'

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  await db.seed.run()
  server = await startAppServer(db)
  browser = await launchBrowser()
})

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

async function signInAsFellow(page: Page) {
  await signInThroughForm(
    browser,
    page,
    server.url,
    DEMO_USERS.find((user) => user.role === 'fellow')!,
  )
  await openPatientsFromMenu(page)
}

describe('Films on a visit in Chromium', () => {
  it('uploads two films with their views and shows their thumbnails', async () => {
    // The demo patient's own header data, so no mismatch is raised (invented demo record).
    const { dicom, png } = await smallPhantomFiles({
      patient: { name: 'HALVORSEN^INGRID', id: 'EPD-104211', birthDate: '19680314', sex: 'F' },
      studyDate: '20260902',
    })
    const page = await browser.newPage()
    await signInAsFellow(page)
    await page.locator('.patients-table').getByText('Halvorsen, Ingrid').click()
    await page.getByRole('heading', { name: 'Halvorsen, Ingrid' }).waitFor()

    await page.getByTestId('film-input').setInputFiles([
      { name: 'standing-lateral.dcm', mimeType: 'application/dicom', buffer: dicom },
      { name: 'flexion.png', mimeType: 'image/png', buffer: png },
    ])
    await page.getByText('standing-lateral.dcm').waitFor()
    await page.getByLabel('View of flexion.png').click()
    await page.getByRole('option', { name: 'Lateral, flexion' }).click()
    await page.getByRole('option', { name: 'Lateral, flexion' }).waitFor({ state: 'hidden' })
    await page
      .getByLabel('View of standing-lateral.dcm')
      .getByText('From the DICOM header')
      .waitFor()
    await page.screenshot({ path: screenshotPath('films-queued'), fullPage: true })
    await page.getByRole('button', { name: 'Upload films' }).click()

    const grid = page.getByRole('list', { name: 'Films of this visit' })
    await expect.poll(() => grid.locator('img').count(), { timeout: 20_000 }).toBe(2)
    await grid.getByText('Lateral, flexion').waitFor()
    await grid.getByText('Lateral, neutral').waitFor()
    await expect.poll(() => page.getByRole('list', { name: 'Films to upload' }).count()).toBe(0)
    const loaded = await grid
      .locator('img')
      .evaluateAll((images) =>
        images.every((image) => (image as unknown as { naturalWidth: number }).naturalWidth > 0),
      )
    expect(loaded).toBe(true)
    await page.screenshot({ path: screenshotPath('films-uploaded'), fullPage: true })

    const stored = await db('images').select('view', 'file_kind').orderBy('id')
    expect(stored).toEqual([
      { view: 'lateral-neutral', file_kind: 'dicom' },
      { view: 'lateral-flexion', file_kind: 'png' },
    ])
    await page.close()
  })

  it('asks before attaching a film whose header names another patient', async () => {
    const { dicom } = await smallPhantomFiles({
      seed: 5,
      patient: { name: 'ELSEWHERE^NOBODY', id: 'ZZZ-1', birthDate: '19500101', sex: 'M' },
      studyDate: '20260902',
    })
    const page = await browser.newPage()
    await signInAsFellow(page)
    await page.locator('.patients-table').getByText('Halvorsen, Ingrid').click()
    await page
      .getByTestId('film-input')
      .setInputFiles([{ name: 'wrong-patient.dcm', mimeType: 'application/dicom', buffer: dicom }])
    await page.getByRole('button', { name: 'Upload films' }).click()
    await page.getByText(/does not match this visit's patient/).waitFor()
    await page.getByText(/name is "ELSEWHERE, NOBODY"/).waitFor()
    await page.screenshot({ path: screenshotPath('films-mismatch'), fullPage: true })
    const before = await db('images').count({ c: '*' })
    await page.getByRole('button', { name: 'Attach to this patient anyway' }).click()
    await expect
      .poll(async () =>
        Number(((await db('images').count({ c: '*' })) as Array<{ c: number }>)[0]!.c),
      )
      .toBe(Number((before as Array<{ c: number }>)[0]!.c) + 1)
    await page.close()
  })

  it('starts a slip-grade reading from a film card and opens it in the workspace', async () => {
    const page = await browser.newPage()
    await signInAsFellow(page)
    await page.locator('.patients-table').getByText('Halvorsen, Ingrid').click()
    const grid = page.getByRole('list', { name: 'Films of this visit' })
    await grid.getByRole('button', { name: 'Read' }).first().click()
    const dialog = page.getByRole('dialog', { name: 'Start a reading' })
    await dialog.getByText('7 landmarks to place.').waitFor()
    await dialog.getByRole('button', { name: 'Open workspace' }).click()
    await expect.poll(() => page.url()).toMatch(/\/readings\/\d+$/)
    await page.getByText('Slip grade L5-S1').first().waitFor()
    await page.getByText('L5 anterior-superior').first().waitFor()
    const readingId = Number(page.url().split('/').pop())
    const stored = await db('readings').where({ id: readingId }).first()
    expect(stored).toMatchObject({ template: 'slip-grade', segment: 'L5-S1', status: 'draft' })
    await page.screenshot({ path: screenshotPath('films-start-reading') })
    // Back on the Patient screen the film card names the reading with a space before the segment.
    await page.goBack()
    await expect
      .poll(() => page.locator('.reading-title').first().innerText(), { timeout: 20_000 })
      .toBe('Slip grade L5-S1')
    await page.close()
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
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

async function signIn(page: Page, role: 'fellow' | 'researcher' | 'admin') {
  await signInThroughForm(
    browser,
    page,
    server.url,
    DEMO_USERS.find((candidate) => candidate.role === role)!,
  )
}

describe('Patients screen in Chromium', () => {
  it('lets a fellow create a patient, find it by search and add a visit', async () => {
    const page = await browser.newPage()
    await signIn(page, 'fellow')
    await openPatientsFromMenu(page)
    await expect.poll(() => page.url()).toContain('/patients')
    await page.getByText('Halvorsen, Ingrid').waitFor()
    await page.screenshot({ path: screenshotPath('patients-fellow'), fullPage: true })

    await page.getByRole('button', { name: 'New patient' }).click()
    const dialog = page.getByRole('dialog', { name: 'New patient' })
    await dialog.getByLabel('Record number').fill('EPD-900001')
    await dialog.getByLabel('Family name').fill('Thornquist')
    await dialog.getByLabel('Given name').fill('Leontine')
    await dialog.getByLabel('Date of birth').fill('1972-09-14')
    await dialog.getByRole('button', { name: 'Add patient' }).click()
    await dialog.waitFor({ state: 'hidden' })

    await page.getByLabel('Search patients').fill('Thornq')
    const table = page.locator('.patients-table')
    await table.getByText('Thornquist, Leontine').waitFor()
    await expect.poll(() => table.locator('tbody tr').count()).toBe(1)
    await table.getByText('Thornquist, Leontine').click()

    await page.getByRole('heading', { name: 'Thornquist, Leontine' }).waitFor()
    await page.getByRole('button', { name: 'New visit' }).click()
    const visitDialog = page.getByRole('dialog', { name: 'New visit' })
    await visitDialog.getByLabel('Date').fill('2026-10-01')
    await visitDialog.getByLabel('Indication').fill('Leg pain on walking')
    await visitDialog.getByRole('button', { name: 'Add visit' }).click()
    await visitDialog.waitFor({ state: 'hidden' })
    await page.getByText('Pre-op · 01 Oct 2026').waitFor()
    await page.screenshot({ path: screenshotPath('patient-with-visit'), fullPage: true })

    const stored = await db('patients').where({ record_number: 'EPD-900001' }).first()
    expect(stored.family_name).toBe('Thornquist')
    expect(await db('visits').where({ patient_id: stored.id })).toHaveLength(1)
    await page.close()
  })

  it('shows a form error without saving when a required field is empty', async () => {
    const page = await browser.newPage()
    await signIn(page, 'fellow')
    await openPatientsFromMenu(page)
    await page.getByRole('button', { name: 'New patient' }).click()
    const dialog = page.getByRole('dialog', { name: 'New patient' })
    await dialog.getByRole('button', { name: 'Add patient' }).click()
    await dialog.getByText('is required').first().waitFor()
    await page.screenshot({ path: screenshotPath('patient-form-errors') })
    expect(await dialog.isVisible()).toBe(true)
    await page.close()
  })

  it('shows a researcher study codes and ages only', async () => {
    const page = await browser.newPage()
    await signIn(page, 'researcher')
    await openPatientsFromMenu(page)
    await page.getByText('EP-4K7Q2M').waitFor()
    const text = await page.locator('body').innerText()
    expect(text).not.toContain('Halvorsen')
    expect(text).not.toContain('EPD-104211')
    expect(await page.getByRole('button', { name: 'New patient' }).count()).toBe(0)
    await page.screenshot({ path: screenshotPath('patients-researcher'), fullPage: true })
    await page.close()
  })

  it('shows an administrator the administration screen with the audit trail, and no patients', async () => {
    const page = await browser.newPage()
    await signIn(page, 'admin')
    await page.getByRole('heading', { name: 'Worklist' }).waitFor()
    await page.getByRole('link', { name: 'Administration' }).click()
    await page.getByRole('heading', { name: 'Administration' }).waitFor()
    await page.getByRole('tab', { name: 'Audit trail' }).click()
    await page.getByText('Signed in').first().waitFor()
    expect(await page.getByRole('link', { name: 'Patients' }).count()).toBe(0)
    await page.screenshot({ path: screenshotPath('administration'), fullPage: true })
    await page.close()
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import { TABLES } from '../../server/db/tables'
import type { Reading } from '../../shared/types/readings'
import type { CaughtMail } from '../../shared/types/mail'
import { templateLandmarks } from '../../shared/readings/templates'
import { openTestDb, truncateAll } from '../support/test-db'
import { createTestUser, testConfig, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import {
  launchBrowser,
  screenshotPath,
  signInThroughForm,
  startAppServer,
} from '../support/browser'
import { linkPathOf, startTestMail, type TestMail } from '../support/mail'

let db: Db
let browser: BrowserContext
let page: Page
let server: { url: string; close(): Promise<void> }
let mail: TestMail
let fellow: TestUser
let surgeon: TestUser
let admin: TestUser
let imageId: number
let truth: Record<string, [number, number]>

const PATIENT = { familyName: 'Osterhagen', givenName: 'Liesel', recordNumber: 'TST-SGN-3' }

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  const config = testConfig()
  fellow = await createTestUser(db, config, 'fellow')
  surgeon = await createTestUser(db, config, 'surgeon')
  admin = await createTestUser(db, config, 'admin')
  const patientId = await insertTestPatient(db, fellow.id, PATIENT)
  await db(TABLES.patients).where({ id: patientId }).update({ responsible_surgeon_id: surgeon.id })
  const visitId = await insertTestVisit(db, patientId, fellow.id, '2026-03-02')
  server = await startAppServer(db)
  // Mail links point at this server, as PUBLIC_URL would.
  mail = await startTestMail(db, { publicUrl: server.url })
  const film = await smallPhantomFiles({ segments: { 'L5-S1': { slipPercent: 18 } } })
  truth = film.film.landmarks.points as Record<string, [number, number]>
  const upload = await request(server.url)
    .post(`/api/visits/${visitId}/images`)
    .set('Cookie', fellow.cookie)
    .field('view', 'lateral-neutral')
    .field('confirmPatientMismatch', 'true')
    .attach('file', film.dicom, 'neutral.dcm')
  if (upload.status !== 201) throw new Error(`film upload failed: ${JSON.stringify(upload.body)}`)
  imageId = upload.body[0].id
  browser = await launchBrowser()
  page = await browser.newPage()
}, 120_000)

afterAll(async () => {
  await browser?.close()
  await mail?.close()
  await server?.close()
  await db?.destroy()
})

/** A fellow's slip-grade draft with every landmark at the phantom's exact position. */
async function fellowDraft(): Promise<Reading> {
  const names = templateLandmarks('slip-grade', { segment: 'L5-S1' }).map((spec) => spec.name)
  const res = await request(server.url)
    .post(`/api/images/${imageId}/readings`)
    .set('Cookie', fellow.cookie)
    .send({
      template: 'slip-grade',
      options: { segment: 'L5-S1' },
      points: Object.fromEntries(names.map((name) => [name, truth[name]])),
    })
  expect(res.status).toBe(201)
  return res.body
}

async function openWorkspace(readingId: number): Promise<void> {
  await page.goto(`${server.url}/readings/${readingId}`)
  await page.locator('[data-testid="film-canvas"] canvas').first().waitFor()
}

const status = () => page.getByTestId('reading-status').innerText()

async function storedStatus(id: number): Promise<string> {
  return (await db(TABLES.readings).where({ id }).first()).status
}

/** The newest caught mail to an address, after the outbox has been delivered. */
async function latestMailTo(address: string): Promise<CaughtMail> {
  const mine = (await mail.deliver()).filter((item) => item.to === address)
  expect(mine.length).toBeGreaterThan(0)
  return mine[mine.length - 1]!
}

describe('sign-off in Chromium', () => {
  it("goes from the fellow's submission to the surgeon's worklist and signature, and back to the fellow", async () => {
    const draft = await fellowDraft()
    await signInThroughForm(browser, page, server.url, fellow)
    await page.getByRole('heading', { name: 'Worklist' }).waitFor()
    await openWorkspace(draft.id)
    await page.getByRole('button', { name: 'Submit for sign-off' }).click()
    await page.getByText('Read only').waitFor()
    expect(await status()).toBe('Awaiting signature')
    expect(await storedStatus(draft.id)).toBe('submitted')

    // The surgeon lands on the worklist with the reading waiting, told by mail.
    const told = await latestMailTo(surgeon.email)
    expect(told.subject).toMatch(/^Reading to sign/)
    expect(told.text).not.toContain(PATIENT.familyName)
    await signInThroughForm(browser, page, server.url, surgeon)
    const awaiting = page.locator('[data-section="awaiting"]')
    await awaiting.getByText('Osterhagen, Liesel').waitFor()
    expect(await awaiting.getByText('Slip grade L5-S1').count()).toBe(1)
    await page.screenshot({ path: screenshotPath('sign-off-surgeon-worklist') })
    await awaiting.getByText('Slip grade L5-S1').click()
    await page.locator('[data-testid="film-canvas"] canvas').first().waitFor()
    expect(await page.getByRole('button', { name: 'Submit for sign-off' }).count()).toBe(0)
    await page.getByRole('button', { name: 'Return with comment' }).waitFor()
    await page.screenshot({ path: screenshotPath('sign-off-surgeon-workspace') })
    await page.getByRole('button', { name: 'Sign', exact: true }).click()
    await page.locator('.p-confirmdialog').getByRole('button', { name: 'Sign' }).click()
    await expect.poll(status).toBe('Signed')
    expect(await storedStatus(draft.id)).toBe('signed')
    await page.getByText('Signed by Test surgeon').waitFor()

    // The fellow finds it signed on the worklist and opens it read-only, with the amendment route.
    expect((await latestMailTo(fellow.email)).subject).toMatch(/^Reading signed/)
    await signInThroughForm(browser, page, server.url, fellow)
    const signed = page.locator('[data-section="signed"]')
    await signed.getByText('Slip grade L5-S1').click()
    await page.locator('[data-testid="film-canvas"] canvas').first().waitFor()
    await expect.poll(status).toBe('Signed')
    await page.getByRole('button', { name: 'Start an amendment' }).waitFor()
    expect(await page.getByRole('button', { name: 'Submit for sign-off' }).count()).toBe(0)
    await page.screenshot({ path: screenshotPath('sign-off-fellow-signed') })
  })

  it('returns a reading with a comment; the fellow follows the mail to it and finds the comment', async () => {
    const draft = await fellowDraft()
    const submitted = await request(server.url)
      .post(`/api/readings/${draft.id}/submit`)
      .set('Cookie', fellow.cookie)
      .send({ version: draft.version })
    expect(submitted.status).toBe(200)
    const comment = 'The S1 posterior corner sits on the ring apophysis; move it to the cortex.'

    await signInThroughForm(browser, page, server.url, surgeon)
    await page.locator('[data-section="awaiting"]').getByText('Slip grade L5-S1').click()
    await page.getByRole('button', { name: 'Return with comment' }).click()
    await page.getByLabel('What should change').fill(comment)
    await page.screenshot({ path: screenshotPath('sign-off-return-dialog') })
    await page.getByRole('button', { name: 'Return', exact: true }).click()
    await expect.poll(status).toBe('Returned for changes')
    expect(await storedStatus(draft.id)).toBe('returned')

    // The mail names no patient and holds no comment; its link opens the reading after sign-in.
    const returnedMail = await latestMailTo(fellow.email)
    expect(returnedMail.subject).toMatch(/^Reading returned for changes/)
    expect(returnedMail.text).not.toContain('ring apophysis')
    expect(returnedMail.text).not.toContain(PATIENT.familyName)
    const link = linkPathOf(returnedMail, server.url)
    expect(link).toBe(`/readings/${draft.id}`)
    await browser.clearCookies()
    await page.goto(`${server.url}${link}`)
    await page.waitForURL(/\/sign-in\?next=/)
    await page.getByLabel('E-mail').fill(fellow.email)
    await page.locator('#password').fill(fellow.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(`${server.url}${link}`)
    const note = page.getByTestId('return-note')
    await note.waitFor()
    expect(await note.innerText()).toContain(comment)
    await page.getByRole('button', { name: 'Submit again' }).waitFor()
    await page.screenshot({ path: screenshotPath('sign-off-fellow-returned') })

    // The worklist shows it among the readings returned, with the comment.
    await page.goto(server.url)
    const returned = page.locator('[data-section="returned"]')
    await returned.getByText(comment).waitFor()

    // The administrator reads the same mail on the Mail screen.
    await signInThroughForm(browser, page, server.url, admin)
    await page.getByRole('link', { name: 'Mail' }).click()
    await page.getByText(returnedMail.subject).first().click()
    await page.locator('.mail-body').getByText('returned your reading with a comment').waitFor()
    await page.screenshot({ path: screenshotPath('sign-off-mail-screen') })
  })

  it('invites a user, who sets a password from the mail and signs in with it', async () => {
    await signInThroughForm(browser, page, server.url, admin)
    await page.getByRole('heading', { name: 'Worklist' }).waitFor()
    await page.goto(`${server.url}/administration`)
    await page.getByRole('tab', { name: 'Invitations' }).click()
    await page.getByLabel('Name').fill('Dr Wren Haldane')
    await page.getByLabel('E-mail').fill('wren.haldane@test.example')
    await page.getByRole('button', { name: 'Send invitation' }).click()
    await page.getByRole('cell', { name: 'wren.haldane@test.example' }).waitFor()

    const invitation = await latestMailTo('wren.haldane@test.example')
    const link = linkPathOf(invitation, server.url)
    expect(link).toMatch(/^\/invitation\//)
    await browser.clearCookies()
    await page.goto(`${server.url}${link}`)
    await page.getByText('wren.haldane@test.example').waitFor()
    const password = 'spondylolisthesis-grade'
    // The form names the rule before anything is sent.
    await page.locator('#new-password').fill('short-one')
    await page.locator('#repeat-password').fill('short-one')
    await page.getByRole('button', { name: 'Create my account' }).click()
    await page.getByText('Use at least 12 characters.').waitFor()
    await page.locator('#new-password').fill(password)
    await page.locator('#repeat-password').fill(password)
    await page.screenshot({ path: screenshotPath('sign-off-invitation') })
    await page.getByRole('button', { name: 'Create my account' }).click()
    await page.getByRole('heading', { name: 'Worklist' }).waitFor()
    expect(await page.getByText('Dr Wren Haldane').count()).toBeGreaterThan(0)

    // The link is used up; the password signs in.
    await browser.clearCookies()
    await page.goto(`${server.url}${link}`)
    await page.getByText(/no longer valid/).waitFor()
    await signInThroughForm(browser, page, server.url, {
      email: 'wren.haldane@test.example',
      password,
    })
    await page.getByRole('heading', { name: 'Worklist' }).waitFor()
    await page.screenshot({ path: screenshotPath('sign-off-invited-worklist') })
  })
})

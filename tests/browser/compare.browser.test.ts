import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import type { PhantomParamsInput } from '../../server/phantom/phantom-params'
import type { ImageRecord } from '../../shared/types/api'
import type { Reading } from '../../shared/types/readings'
import type { LandmarkDocument } from '../../shared/types/landmarks'
import { templateLandmarks } from '../../shared/readings/templates'
import { computeMeasurements } from '../../shared/measurement'
import { openTestDb, truncateAll } from '../support/test-db'
import { createTestUser, testConfig, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { launchBrowser, screenshotPath, startAppServer } from '../support/browser'
import { pdfPageTexts } from '../support/pdf-text'
import { REPORT_CAUTIONS } from '../../shared/reports/cautions'

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }
let surgeon: TestUser
let patientId: number
let preOpReading: Reading
let postOpReading: Reading
let preOpTruth: LandmarkDocument
let postOpTruth: LandmarkDocument
let postOpVisitId: number

// Invented course: L4-L5 lordosis 19° before surgery, 27° after (a gain of 8°).
const PRE_OP: PhantomParamsInput = {
  segments: { 'L4-L5': { segmentalAngleDeg: 19, slipPercent: 12 } },
}
const POST_OP: PhantomParamsInput = {
  segments: { 'L4-L5': { segmentalAngleDeg: 27, slipPercent: 3 } },
}

async function uploadAndRead(
  visitId: number,
  params: PhantomParamsInput,
): Promise<{ reading: Reading; truth: LandmarkDocument }> {
  const files = await smallPhantomFiles(params)
  const upload = await browser.request.post(`${server.url}/api/visits/${visitId}/images`, {
    multipart: {
      view: 'lateral-neutral',
      confirmPatientMismatch: 'true',
      file: { name: 'film.dcm', mimeType: 'application/dicom', buffer: files.dicom },
    },
  })
  expect(upload.status()).toBe(201)
  const [image] = (await upload.json()) as ImageRecord[]
  const truth = files.film.landmarks
  const points = Object.fromEntries(
    templateLandmarks('lumbar-alignment').map((spec) => [spec.name, truth.points[spec.name]!]),
  )
  const created = await browser.request.post(`${server.url}/api/images/${image!.id}/readings`, {
    data: { template: 'lumbar-alignment', points },
  })
  expect(created.status()).toBe(201)
  const reading = (await created.json()) as Reading
  const submitted = await browser.request.post(`${server.url}/api/readings/${reading.id}/submit`, {
    data: { version: reading.version },
  })
  expect(submitted.status()).toBe(200)
  return { reading: (await submitted.json()) as Reading, truth }
}

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  surgeon = await createTestUser(db, testConfig(), 'surgeon')
  patientId = await insertTestPatient(db, surgeon.id, { familyName: 'Oyelaran', givenName: 'Tove' })
  const preOpVisit = await insertTestVisit(db, patientId, surgeon.id, '2026-02-02', 'pre-op')
  const postOpVisit = await insertTestVisit(db, patientId, surgeon.id, '2026-04-14', 'post-op')
  postOpVisitId = postOpVisit
  server = await startAppServer(db)
  browser = await launchBrowser()
  const [name, value] = surgeon.cookie.split('=') as [string, string]
  await browser.addCookies([{ name, value, url: server.url }])
  ;({ reading: preOpReading, truth: preOpTruth } = await uploadAndRead(preOpVisit, PRE_OP))
  ;({ reading: postOpReading, truth: postOpTruth } = await uploadAndRead(postOpVisit, POST_OP))
})

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

interface ViewState {
  box: { x: number; y: number; width: number; height: number }
  scale: number
  offsetX: number
  offsetY: number
}

async function viewState(page: Page, side: 'before' | 'after'): Promise<ViewState> {
  const surface = page.locator(`[data-testid="compare-canvas"][data-side="${side}"]`)
  const box = (await surface.boundingBox())!
  const attr = async (name: string) => Number(await surface.getAttribute(name))
  return {
    box,
    scale: await attr('data-view-scale'),
    offsetX: await attr('data-view-offset-x'),
    offsetY: await attr('data-view-offset-y'),
  }
}

const middleOf = (view: ViewState): [number, number] => [
  view.box.x + view.box.width / 2,
  view.box.y + view.box.height / 2,
]

async function waitForFilms(page: Page): Promise<void> {
  await page.locator('[data-testid="compare-canvas"] canvas').first().waitFor()
  await expect
    .poll(() => page.locator('[data-testid="compare-canvas"] canvas').count())
    .toBeGreaterThanOrEqual(4)
  await expect.poll(() => page.locator('.loading').count(), { timeout: 15_000 }).toBe(0)
}

describe('Compare in Chromium', () => {
  it('opens the usual pair from the patient screen with both readings and the table', async () => {
    const page = await browser.newPage()
    await page.goto(`${server.url}/patients/${patientId}`)
    const launcher = page.getByRole('region', { name: 'Compare films' })
    await launcher.getByRole('link', { name: /Pre-op against post-op/ }).waitFor()
    await launcher.screenshot({ path: screenshotPath('patient-compare-launcher') })
    await page.getByRole('link', { name: /Pre-op against post-op/ }).click()
    await page.waitForURL(/\/compare\?images=/)
    await waitForFilms(page)
    await expect.poll(() => page.getByTestId('compare-differences').count()).toBe(1)
    // Earlier film on the left: the pre-op film.
    await expect(page.locator('[data-side="before"]').locator('..').innerText()).resolves.toMatch(
      /Pre-op/,
    )
    const change = page.locator('[data-cell="L4-L5-lordosis"] .change')
    const expected =
      computeMeasurements(postOpTruth).segments['L4-L5']!.segmentalLordosisDeg! -
      computeMeasurements(preOpTruth).segments['L4-L5']!.segmentalLordosisDeg!
    expect(Number(await change.getAttribute('data-change'))).toBeCloseTo(expected, 2)
    expect(await change.innerText()).toMatch(/^\+8\.0° ± \d+\.\d°$/)
    // Each side says where its mm scale comes from.
    expect(await page.locator('.calibration').allInnerTexts()).toEqual([
      expect.stringMatching(/Scale: 0\.\d{4} mm\/px · DICOM pixel spacing/),
      expect.stringMatching(/Scale: 0\.\d{4} mm\/px · DICOM pixel spacing/),
    ])
    await page.mouse.move(5, 5)
    await page.screenshot({ path: screenshotPath('compare-fitted') })
    await page.close()
  })

  it('zooms and pans both films together, and not once unlinked', async () => {
    const page = await browser.newPage()
    await page.goto(
      `${server.url}/patients/${patientId}/compare?images=${preOpReading.imageId},${postOpReading.imageId}`,
    )
    await waitForFilms(page)
    const fittedBefore = await viewState(page, 'before')
    const fittedAfter = await viewState(page, 'after')

    // Zoom the earlier film round L4-L5: the later one follows to the same zoom over its fit
    // (the two films are the same size, so to the same scale and offset).
    const l4 = preOpTruth.points['L4.pi']!
    await page.mouse.move(
      fittedBefore.box.x + fittedBefore.offsetX + l4[0] * fittedBefore.scale,
      fittedBefore.box.y + fittedBefore.offsetY + l4[1] * fittedBefore.scale,
    )
    await page.mouse.wheel(0, -600)
    await expect
      .poll(async () => (await viewState(page, 'before')).scale)
      .toBeGreaterThan(fittedBefore.scale * 1.8)
    const zoomedBefore = await viewState(page, 'before')
    await expect
      .poll(async () => (await viewState(page, 'after')).scale)
      .toBeCloseTo((zoomedBefore.scale / fittedBefore.scale) * fittedAfter.scale, 6)
    const zoomedAfter = await viewState(page, 'after')
    expect(zoomedAfter.offsetX).toBeCloseTo(zoomedBefore.offsetX, 3)
    expect(zoomedAfter.offsetY).toBeCloseTo(zoomedBefore.offsetY, 3)
    await page.mouse.move(5, 5)
    await page.screenshot({ path: screenshotPath('compare-linked-zoom') })

    // A drag on the later film pans the earlier one by as much.
    const [x, y] = middleOf(zoomedAfter)
    await page.mouse.move(x, y)
    await page.mouse.down()
    await page.mouse.move(x - 60, y - 40, { steps: 6 })
    await page.mouse.up()
    await expect
      .poll(async () => (await viewState(page, 'before')).offsetX)
      .toBeCloseTo(zoomedBefore.offsetX - 60, 3)

    // Unlinked, the later film keeps its view while the earlier one zooms.
    await page.getByText('Link zoom and pan').click()
    const heldAfter = await viewState(page, 'after')
    await page.mouse.move(...middleOf(zoomedBefore))
    await page.mouse.wheel(0, 400)
    await expect
      .poll(async () => (await viewState(page, 'before')).scale)
      .toBeLessThan(zoomedBefore.scale * 0.8)
    expect((await viewState(page, 'after')).scale).toBeCloseTo(heldAfter.scale, 9)
    // Space held pans as in the workspace; editing keys do nothing here.
    await page.keyboard.press('Delete')
    await page.keyboard.press('Control+z')
    expect(await page.getByTestId('compare-differences').count()).toBe(1)
    await page.mouse.move(5, 5)
    await page.screenshot({ path: screenshotPath('compare-unlinked') })
    await page.close()
  })

  it('is offered from a reading, with the reading on its film and the usual partner suggested', async () => {
    const page = await browser.newPage()
    await page.goto(`${server.url}/readings/${postOpReading.id}`)
    await page.getByRole('button', { name: 'Compare' }).click()
    await page.waitForURL(/\/compare\?images=\d+&readings=/)
    await page.getByRole('button', { name: 'Pre-op against post-op' }).waitFor()
    await page.screenshot({ path: screenshotPath('compare-choose-partner') })
    await page.getByRole('button', { name: 'Pre-op against post-op' }).click()
    await waitForFilms(page)
    expect(page.url()).toContain(`readings=${postOpReading.id}`)
    expect(await page.locator('[data-side="after"]').locator('..').innerText()).toMatch(
      /Lumbar alignment, awaiting sign-off/,
    )
    await page.close()
  })

  it('prints the comparison, and the reading with the same content as its PDF', async () => {
    const page = await browser.newPage()
    await page.goto(
      `${server.url}/patients/${patientId}/compare?images=${preOpReading.imageId},${postOpReading.imageId}`,
    )
    await waitForFilms(page)
    const [printable] = await Promise.all([
      browser.waitForEvent('page'),
      page.getByRole('button', { name: 'Print' }).click(),
    ])
    await printable.locator('.report-table').first().waitFor()
    // The page's image element; the server's tsconfig has no DOM types.
    type Loading = { complete: boolean; addEventListener(type: 'load', done: () => void): void }
    await printable
      .locator('.report-film img')
      .first()
      .evaluate((image: Loading) =>
        image.complete
          ? undefined
          : new Promise<void>((resolve) => image.addEventListener('load', resolve)),
      )
    const text = await printable.locator('.report-page').innerText()
    expect(text).toMatch(
      /L4-L5 · Segmental lordosis\s+19\.0° ± \d+\.\d°\s+27\.0° ± \d+\.\d°\s+\+8\.0° ± \d+\.\d°/,
    )
    for (const caution of REPORT_CAUTIONS) expect(text).toContain(caution)
    expect(await printable.getByTestId('report-stamp').innerText()).toBe('NOT ALL READINGS SIGNED')
    await printable.screenshot({ path: screenshotPath('compare-printable'), fullPage: true })
    await printable.emulateMedia({ media: 'print' })
    expect(await printable.locator('.app-header').isVisible()).toBe(false)
    expect(await printable.locator('.print-toolbar').isVisible()).toBe(false)
    await printable.screenshot({
      path: screenshotPath('compare-printable-print-media'),
      fullPage: true,
    })
    // What "Print" gives on paper (the browser's own PDF), kept for a human look.
    await printable.pdf({
      path: screenshotPath('compare-printed').replace(/\.png$/, '.pdf'),
      preferCSSPageSize: true,
    })
    await printable.close()

    // The reading's printable page and its PDF carry the same words and numbers.
    await page.goto(`${server.url}/readings/${postOpReading.id}`)
    const [readingPage] = await Promise.all([
      browser.waitForEvent('page'),
      page.getByRole('button', { name: 'Print' }).click(),
    ])
    await readingPage.locator('.report-table').first().waitFor()
    const rows = await readingPage
      .locator('[data-table="results-alignment"] tbody tr')
      .evaluateAll((trs) => trs.map((tr) => [...tr.children].map((td) => td.textContent ?? '')))
    expect(rows.length).toBeGreaterThan(5)
    const pdf = await browser.request.get(
      `${server.url}/api/readings/${postOpReading.id}/report.pdf`,
    )
    expect(pdf.status()).toBe(200)
    const pdfText = (await pdfPageTexts(await pdf.body())).join(' ').replace(/\s+/g, ' ')
    for (const cells of rows)
      for (const cell of cells.slice(0, 4)) expect(pdfText).toContain(cell.trim())
    await readingPage.screenshot({ path: screenshotPath('reading-printable'), fullPage: true })
    await readingPage.close()
    await page.close()
  })
  it('sets two frontal films side by side with the disc replacement offset change in its own table', async () => {
    // Invented course of an L4-L5 disc replacement on the frontal film: 1.0 mm toward the image's
    // right after surgery, 3.5 mm at follow-up (phantom ground truth: a change of +2.5 mm).
    const followUpVisit = await insertTestVisit(
      db,
      patientId,
      surgeon.id,
      '2026-10-20',
      'follow-up',
    )
    const options = { discReplacements: ['L4-L5'] }
    const readAp = async (visitId: number, lateralOffsetMm: number) => {
      const files = await smallPhantomFiles({
        view: 'ap',
        seriesDescription: 'LUMBAR SPINE AP',
        widthPx: 625,
        heightPx: 750,
        implants: [{ kind: 'disc-replacement', segment: 'L4-L5', lateralOffsetMm }],
      })
      const upload = await browser.request.post(`${server.url}/api/visits/${visitId}/images`, {
        multipart: {
          view: 'ap',
          confirmPatientMismatch: 'true',
          file: { name: 'ap.dcm', mimeType: 'application/dicom', buffer: files.dicom },
        },
      })
      expect(upload.status()).toBe(201)
      const [image] = (await upload.json()) as ImageRecord[]
      const truth = files.film.landmarks.points
      const points = Object.fromEntries(
        templateLandmarks('implant-centring', options as never)
          .filter((spec) => truth[spec.name])
          .map((spec) => [spec.name, truth[spec.name]!]),
      )
      const created = await browser.request.post(`${server.url}/api/images/${image!.id}/readings`, {
        data: { template: 'implant-centring', options, points },
      })
      expect(created.status()).toBe(201)
    }
    await readAp(postOpVisitId, 1)
    await readAp(followUpVisit, 3.5)

    const page = await browser.newPage()
    await page.goto(`${server.url}/patients/${patientId}`)
    const launcher = page.getByRole('region', { name: 'Compare films' })
    await launcher.getByRole('link', { name: /Post-op AP against latest follow-up AP/ }).click()
    await page.waitForURL(/\/compare\?images=/)
    await waitForFilms(page)
    const frontal = page.getByTestId('compare-frontal')
    await frontal.waitFor()
    const change = frontal.locator('[data-cell="L4-L5-frontal-offset-mm"] .change')
    expect(Number(await change.getAttribute('data-change'))).toBeCloseTo(2.5, 6)
    expect(await change.innerText()).toMatch(/^\+2\.5 mm ± \d+\.\d mm$/)
    expect(await frontal.textContent()).toContain('Implant coronal tilt')
    await page.screenshot({ path: screenshotPath('compare-frontal') })
    await page.close()
  })
})

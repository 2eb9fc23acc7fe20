import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import type { ImageRecord } from '../../shared/types/api'
import type { Reading } from '../../shared/types/readings'
import type { LandmarkDocument } from '../../shared/types/landmarks'
import { templateLandmarks } from '../../shared/readings/templates'
import { computeMeasurements } from '../../shared/measurement'
import { phantomPreset } from '../../server/phantom/presets'
import { openTestDb, truncateAll } from '../support/test-db'
import { createTestUser, testConfig, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { launchBrowser, screenshotPath, sourceTagsShown, startAppServer } from '../support/browser'

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }
let fellow: TestUser
let visitId: number
let postOpVisitId: number

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  const config = testConfig()
  fellow = await createTestUser(db, config, 'fellow')
  const patientId = await insertTestPatient(db, fellow.id, {
    familyName: 'Marchetti',
    givenName: 'Ilse',
  })
  visitId = await insertTestVisit(db, patientId, fellow.id, '2026-03-02')
  postOpVisitId = await insertTestVisit(db, patientId, fellow.id, '2026-05-11', 'post-op')
  server = await startAppServer(db)
  browser = await launchBrowser()
  const [name, value] = fellow.cookie.split('=') as [string, string]
  await browser.addCookies([{ name, value, url: server.url }])
})

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

/** The status, with the body when it is an error, so a failure says what the server answered. */
async function statusWithBody(response: {
  status(): number
  text(): Promise<string>
}): Promise<number | string> {
  return response.status() < 400
    ? response.status()
    : `${response.status()} ${await response.text()}`
}

/** Uploads a phantom film through the films API (the header patient is invented, so confirm it). */
async function uploadPhantom(
  preset: string,
  view = 'lateral-neutral',
  toVisit = visitId,
): Promise<{ image: ImageRecord; truth: LandmarkDocument }> {
  const files = await smallPhantomFiles(phantomPreset(preset))
  const response = await browser.request.post(`${server.url}/api/visits/${toVisit}/images`, {
    multipart: {
      view,
      confirmPatientMismatch: 'true',
      file: { name: `${preset}.dcm`, mimeType: 'application/dicom', buffer: files.dicom },
    },
  })
  expect(await statusWithBody(response)).toBe(201)
  const [image] = (await response.json()) as ImageRecord[]
  return { image: image as ImageRecord, truth: files.film.landmarks }
}

async function createReading(imageId: number, body: Record<string, unknown>): Promise<Reading> {
  const response = await browser.request.post(`${server.url}/api/images/${imageId}/readings`, {
    data: body,
  })
  expect(await statusWithBody(response)).toBe(201)
  return (await response.json()) as Reading
}

async function storedReading(id: number): Promise<Reading> {
  return (await (await browser.request.get(`${server.url}/api/readings/${id}`)).json()) as Reading
}

interface ViewState {
  box: { x: number; y: number }
  scale: number
  offsetX: number
  offsetY: number
}

/** The transform the canvas renders with, read from its attributes, and where the stage sits. */
async function viewState(page: Page, side = 'primary'): Promise<ViewState> {
  const surface = page.locator(`[data-testid="film-canvas"][data-side="${side}"]`)
  const box = await surface.boundingBox()
  const attr = async (name: string) => Number(await surface.getAttribute(name))
  return {
    box: { x: box!.x, y: box!.y },
    scale: await attr('data-view-scale'),
    offsetX: await attr('data-view-offset-x'),
    offsetY: await attr('data-view-offset-y'),
  }
}

function toScreen(view: ViewState, [x, y]: readonly [number, number]): [number, number] {
  return [view.box.x + view.offsetX + x * view.scale, view.box.y + view.offsetY + y * view.scale]
}

async function openWorkspace(page: Page, readingId: number): Promise<void> {
  await page.goto(`${server.url}/readings/${readingId}`)
  const canvas = page.locator('[data-testid="film-canvas"] canvas').first()
  const refused = page.locator('.workspace-message [role="alert"], .workspace-message .p-message')
  await canvas.or(refused).first().waitFor()
  // A refused reading shows its message; say it rather than time out.
  if (await refused.count())
    throw new Error(`The workspace did not open: ${await refused.first().innerText()}`)
  await expect
    .poll(
      () => page.locator('[data-testid="film-canvas"]').first().getAttribute('data-full-depth'),
      {
        timeout: 15_000,
      },
    )
    .toBe('yes')
}

async function resultValue(page: Page, id: string): Promise<string> {
  return (await page.locator(`[data-result="${id}"] .value`).innerText()).trim()
}

function parseNumber(text: string): number {
  return Number(text.replace('−', '-').replace(/[^0-9.-]/g, ''))
}

describe('Reading workspace in Chromium', () => {
  let slipReading: Reading
  let slipTruth: LandmarkDocument

  it('places every Slip grade landmark by clicking and shows the phantom slip and its grade', async () => {
    const { image, truth } = await uploadPhantom('meyerding-2')
    slipTruth = truth
    slipReading = await createReading(image.id, {
      template: 'slip-grade',
      options: { segment: 'L5-S1' },
    })
    const page = await browser.newPage()
    await openWorkspace(page, slipReading.id)

    // Zoom in around the segment (wheel at the cursor) so neighbouring corners are far apart.
    const specs = templateLandmarks('slip-grade', { segment: 'L5-S1' })
    const truthPoints = specs.map((spec) => truth.points[spec.name]!)
    const centre: [number, number] = [
      truthPoints.reduce((sum, p) => sum + p[0], 0) / truthPoints.length,
      truthPoints.reduce((sum, p) => sum + p[1], 0) / truthPoints.length,
    ]
    const fitted = await viewState(page)
    await page.mouse.move(...toScreen(fitted, centre))
    await page.mouse.wheel(0, -500)
    await expect.poll(async () => (await viewState(page)).scale).toBeGreaterThan(fitted.scale * 1.5)
    const view = await viewState(page)

    for (const [index, spec] of specs.entries()) {
      const at = toScreen(view, truth.points[spec.name]!)
      if (index === specs.length - 1) {
        // The loupe follows the cursor while placing.
        await page.mouse.move(...at)
        await page.locator('.loupe').waitFor()
        await page.screenshot({ path: screenshotPath('workspace-loupe') })
      }
      await page.mouse.click(...at)
    }
    await expect
      .poll(() => page.getByText(`${specs.length} / ${specs.length} placed`).count())
      .toBe(1)

    // The ground truth: the engine on the phantom's exact landmarks (the phantom draws the film
    // from the same geometry, server/phantom).
    const expected = computeMeasurements(truth).segments['L5-S1']!
    const slip = parseNumber(await resultValue(page, 'L5-S1-slip'))
    expect(Math.abs(slip - expected.slipPercent!)).toBeLessThan(0.5)
    // Meyerding 1932 [M]: 25–50 % is grade II (reference §3); the preset is a 38 % slip.
    expect(await resultValue(page, 'L5-S1-grade')).toBe('Grade II')
    await expect
      .poll(() => page.getByTestId('save-state').innerText(), { timeout: 10_000 })
      .toContain('Saved')
    await page.mouse.move(5, 5)
    await page.screenshot({ path: screenshotPath('workspace-slip-grade') })
    expect(await sourceTagsShown(page, '.results')).toEqual([])
    await page.close()
  })

  it('suggests the corner near a placed point; a click on it or Enter accepts, Escape keeps the own point', async () => {
    const { image, truth } = await uploadPhantom('meyerding-2')
    const reading = await createReading(image.id, {
      template: 'slip-grade',
      options: { segment: 'L5-S1' },
    })
    const page = await browser.newPage()
    await openWorkspace(page, reading.id)
    const surface = page.locator('[data-testid="film-canvas"][data-side="primary"]')
    const mmPerPixel = image.mmPerPixel![1]
    // About 1.5 mm off the true corner, inside the default 3 mm search radius.
    const near = (name: string): [number, number] => {
      const [x, y] = truth.points[name]!
      return [x + 1.2 / mmPerPixel, y - 0.9 / mmPerPixel]
    }
    const suggestion = async (): Promise<[number, number]> => {
      await expect.poll(() => surface.getAttribute('data-suggestion-x')).not.toBeNull()
      return [
        Number(await surface.getAttribute('data-suggestion-x')),
        Number(await surface.getAttribute('data-suggestion-y')),
      ]
    }
    const distance = (a: readonly number[], b: readonly number[]) =>
      Math.hypot(a[0]! - b[0]!, a[1]! - b[1]!)
    const view = await viewState(page)

    // L5.as: a click on the amber mark accepts it.
    await page.mouse.click(...toScreen(view, near('L5.as')))
    const first = await suggestion()
    await page.mouse.move(5, 5)
    await page.screenshot({ path: screenshotPath('workspace-corner-suggestion') })
    // The phantom draws its corners where the truth is (server/phantom): the suggestion lies
    // nearer the true corner than the click did.
    expect(distance(first, truth.points['L5.as']!)).toBeLessThan(
      distance(near('L5.as'), truth.points['L5.as']!),
    )
    await page.mouse.click(...toScreen(view, first))
    await expect.poll(() => surface.getAttribute('data-suggestion-x')).toBeNull()

    // L5.ps: Enter accepts.
    await page.mouse.click(...toScreen(view, near('L5.ps')))
    const second = await suggestion()
    await page.keyboard.press('Enter')
    await expect.poll(() => surface.getAttribute('data-suggestion-x')).toBeNull()

    // L5.pi: Escape keeps the rater's own point.
    await page.mouse.click(...toScreen(view, near('L5.pi')))
    await suggestion()
    await page.keyboard.press('Escape')
    await expect.poll(() => surface.getAttribute('data-suggestion-x')).toBeNull()

    await expect
      .poll(() => page.getByTestId('save-state').innerText(), { timeout: 10_000 })
      .toContain('Saved')
    const stored = await storedReading(reading.id)
    expect(stored.landmarks.points['L5.as']).toEqual(first)
    expect(stored.landmarks.points['L5.ps']).toEqual(second)
    expect(distance(stored.landmarks.points['L5.pi']!, near('L5.pi'))).toBeLessThan(1)
    expect(stored.suggestionUse.points).toEqual({ 'L5.as': true, 'L5.ps': true, 'L5.pi': false })
    await page.close()
  })

  it('drags a landmark: the slip changes and the draft is saved on the server', async () => {
    const page = await browser.newPage()
    await openWorkspace(page, slipReading.id)
    const before = parseNumber(await resultValue(page, 'L5-S1-slip'))
    const stored = await storedReading(slipReading.id)
    const view = await viewState(page)
    const [x, y] = toScreen(view, stored.landmarks.points['L5.pi']!)
    await page.mouse.move(x, y)
    await page.mouse.down()
    for (let step = 1; step <= 10; step++) await page.mouse.move(x + step * 2, y)
    await page.mouse.up()
    await expect
      .poll(async () => parseNumber(await resultValue(page, 'L5-S1-slip')))
      .not.toBeCloseTo(before, 1)
    await expect
      .poll(() => page.getByTestId('save-state').innerText(), { timeout: 10_000 })
      .toContain('Saved')
    const after = await storedReading(slipReading.id)
    expect(after.version).toBeGreaterThan(stored.version)
    expect(after.landmarks.points['L5.pi']![0]).toBeGreaterThan(
      stored.landmarks.points['L5.pi']![0] + 5,
    )
    // Undo puts the point back (one step for the whole drag).
    await page.keyboard.press('Control+z')
    await expect
      .poll(async () => parseNumber(await resultValue(page, 'L5-S1-slip')))
      .toBeCloseTo(before, 1)
    await expect
      .poll(() => page.getByTestId('save-state').innerText(), { timeout: 10_000 })
      .toContain('Saved')
    expect(slipTruth.points['L5.pi']).toBeDefined()
    await page.close()
  })

  it('shows the conflict when the same reading is edited in two tabs, and loads the other version', async () => {
    const first = await browser.newPage()
    const second = await browser.newPage()
    await openWorkspace(first, slipReading.id)
    await openWorkspace(second, slipReading.id)

    async function nudge(page: Page, name: string, dx: number) {
      const stored = await storedReading(slipReading.id)
      const view = await viewState(page)
      const [x, y] = toScreen(view, stored.landmarks.points[name]!)
      await page.mouse.move(x, y)
      await page.mouse.down()
      await page.mouse.move(x + dx / 2, y)
      await page.mouse.move(x + dx, y)
      await page.mouse.up()
    }

    await nudge(first, 'L5.as', 12)
    await expect
      .poll(() => first.getByTestId('save-state').innerText(), { timeout: 10_000 })
      .toContain('Saved')
    await nudge(second, 'L5.ai', -12)
    const dialog = second.getByRole('dialog', { name: 'This reading changed elsewhere' })
    await dialog.waitFor({ timeout: 10_000 })
    expect(await second.getByTestId('save-state').innerText()).toContain('Conflict')
    await second.screenshot({ path: screenshotPath('workspace-conflict') })
    await dialog.getByRole('button', { name: 'Load their version' }).click()
    await dialog.waitFor({ state: 'hidden' })
    expect(await second.getByTestId('save-state').innerText()).toContain('Saved')
    await first.close()
    await second.close()
  })

  it('keeps an edit made offline, warns before leaving, and saves it when the network returns', async () => {
    const specs = templateLandmarks('slip-grade', { segment: 'L5-S1' })
    const allButLast = Object.fromEntries(
      specs.slice(0, -1).map((spec) => [spec.name, slipTruth.points[spec.name]!]),
    )
    const reading = await createReading(slipReading.imageId, {
      template: 'slip-grade',
      options: { segment: 'L5-S1' },
      points: allButLast,
    })
    const page = await browser.newPage()
    await openWorkspace(page, reading.id)
    await browser.setOffline(true)
    try {
      const view = await viewState(page)
      await page.mouse.click(...toScreen(view, slipTruth.points['S1.pw']!))
      await expect
        .poll(() => page.getByTestId('save-state').innerText(), { timeout: 10_000 })
        .toContain('Offline')
      await page.getByRole('link', { name: 'Back to the patient' }).click()
      const confirm = page
        .getByRole('alertdialog', { name: 'Leave with unsaved changes?' })
        .or(page.getByRole('dialog', { name: 'Leave with unsaved changes?' }))
      await confirm.waitFor()
      await confirm.getByRole('button', { name: 'Stay' }).click()
      expect(page.url()).toContain(`/readings/${reading.id}`)
    } finally {
      await browser.setOffline(false)
    }
    await expect
      .poll(() => page.getByTestId('save-state').innerText(), { timeout: 20_000 })
      .toContain('Saved')
    expect((await storedReading(reading.id)).landmarks.points['S1.pw']).toBeDefined()
    await page.close()
  })

  it('steps with Tab, removes with Delete, undoes with Ctrl+Z, and fits the film again', async () => {
    const page = await browser.newPage()
    await openWorkspace(page, slipReading.id)
    const fitted = await viewState(page)
    const counter = page.getByText(/\d+ \/ 7 placed/)
    expect(await counter.innerText()).toBe('7 / 7 placed')
    await page.locator('[data-testid="film-canvas"]').hover()
    await page.keyboard.press('Tab')
    await expect
      .poll(() => page.locator('[aria-current="step"]').innerText())
      .toContain('L5 anterior-superior')
    await page.keyboard.press('Tab')
    await expect
      .poll(() => page.locator('[aria-current="step"]').innerText())
      .toContain('L5 posterior-superior')
    await page.keyboard.press('Delete')
    await expect.poll(() => counter.innerText()).toBe('6 / 7 placed')
    await page.keyboard.press('Control+z')
    await expect.poll(() => counter.innerText()).toBe('7 / 7 placed')
    await page.mouse.wheel(0, -400)
    await expect.poll(async () => (await viewState(page)).scale).toBeGreaterThan(fitted.scale * 1.2)
    await page.getByRole('button', { name: 'Fit' }).click()
    await expect.poll(async () => (await viewState(page)).scale).toBeCloseTo(fitted.scale, 6)
    await expect
      .poll(() => page.getByTestId('save-state').innerText(), { timeout: 10_000 })
      .toContain('Saved')
    await page.close()
  })

  it('submits the reading for sign-off and then shows it read-only', async () => {
    const page = await browser.newPage()
    await openWorkspace(page, slipReading.id)
    await page.getByRole('button', { name: 'Submit for sign-off' }).click()
    await page.getByText('Read only').waitFor()
    expect((await storedReading(slipReading.id)).status).toBe('submitted')
    // Clicking on the film places nothing now.
    const before = (await storedReading(slipReading.id)).landmarks.points
    const box = (await page.locator('[data-testid="film-canvas"]').boundingBox())!
    await page.mouse.click(box.x + 40, box.y + 40)
    await page.keyboard.press('Delete')
    expect((await storedReading(slipReading.id)).landmarks.points).toEqual(before)
    expect(await page.getByRole('button', { name: 'Undo' }).count()).toBe(0)
    await page.close()
  })

  it('calibrates an uncalibrated film on a line of known length', async () => {
    const files = await smallPhantomFiles(phantomPreset('meyerding-1'))
    const upload = await browser.request.post(`${server.url}/api/visits/${visitId}/images`, {
      multipart: {
        view: 'lateral-neutral',
        file: { name: 'plain.png', mimeType: 'image/png', buffer: files.png },
      },
    })
    expect(await statusWithBody(upload)).toBe(201)
    const [image] = (await upload.json()) as ImageRecord[]
    expect(image!.spacingSource).toBe('none')
    const reading = await createReading(image!.id, {
      template: 'slip-grade',
      options: { segment: 'L5-S1' },
      points: Object.fromEntries(
        templateLandmarks('slip-grade', { segment: 'L5-S1' }).map((spec) => [
          spec.name,
          files.film.landmarks.points[spec.name]!,
        ]),
      ),
    })
    const page = await browser.newPage()
    await openWorkspace(page, reading.id)
    expect(await page.locator('[data-result="L5-S1-slip-mm"] .value').innerText()).toBe('—')
    await page.getByRole('button', { name: 'Calibrate' }).click()
    const view = await viewState(page)
    const from = toScreen(view, [200, 300])
    const to = toScreen(view, [300, 300])
    await page.mouse.move(...from)
    await page.mouse.down()
    await page.mouse.move((from[0] + to[0]) / 2, from[1])
    await page.mouse.move(...to)
    await page.mouse.up()
    const dialog = page.getByRole('dialog', { name: 'Calibrate the film' })
    await dialog.waitFor()
    await dialog.getByLabel('True length (mm)').fill('40')
    await dialog.getByRole('button', { name: 'Save calibration' }).click()
    await dialog.waitFor({ state: 'hidden' })
    // 40 mm over a 100 px line: 0.4 mm per pixel, from a manual calibration (reference §5).
    await page.getByText('0.4000 mm/px').waitFor()
    expect(await page.locator('[data-result="L5-S1-slip-mm"] .calibration').innerText()).toBe(
      'manual calibration',
    )
    const stored = (await (
      await browser.request.get(`${server.url}/api/images/${image!.id}`)
    ).json()) as ImageRecord
    expect(stored.spacingSource).toBe('manual')
    expect(stored.mmPerPixel![1]).toBeCloseTo(0.4, 2)
    await page.close()
  })

  it('shows Lumbar alignment with every landmark and its overlays', async () => {
    const { image, truth } = await uploadPhantom('normal')
    const reading = await createReading(image.id, {
      template: 'lumbar-alignment',
      points: truth.points,
    })
    const page = await browser.newPage()
    await openWorkspace(page, reading.id)
    await page.locator('[data-result="pi"]').waitFor()
    const expected = computeMeasurements(truth)
    // Legaye et al. 1998 [V]: PI = PT + SS, here read back from the panel.
    const pi = parseNumber(await resultValue(page, 'pi'))
    expect(Math.abs(pi - expected.pelvis!.incidenceDeg!)).toBeLessThan(0.1)
    await page.screenshot({ path: screenshotPath('workspace-lumbar-alignment') })
    expect(await sourceTagsShown(page, '.results')).toEqual([])
    // Invert goes through the full-depth window in the worker; the film is redrawn.
    await page.getByRole('button', { name: 'Invert' }).click()
    await page.getByRole('button', { name: 'Inverted' }).waitFor()
    await page.waitForTimeout(500)
    await page.screenshot({ path: screenshotPath('workspace-inverted') })
    await page.close()
  })

  it('shows Construct check on a post-op film with a cage and disc replacements', async () => {
    const { image, truth } = await uploadPhantom('hybrid-post-op', 'lateral-neutral', postOpVisitId)
    const construct = [
      { segment: 'L5-S1', implant: 'cage' },
      { segment: 'L4-L5', implant: 'disc-replacement' },
    ] as const
    const names = new Set(
      templateLandmarks('construct-check', { construct: [...construct] }).map((spec) => spec.name),
    )
    const points = Object.fromEntries(
      Object.entries(truth.points).filter(([name]) => names.has(name)),
    )
    const reading = await createReading(image.id, {
      template: 'construct-check',
      options: { construct },
      points,
    })
    const page = await browser.newPage()
    await openWorkspace(page, reading.id)
    await page.locator('[data-result="L5-S1-cage"]').waitFor()
    expect(await resultValue(page, 'L5-S1-cage')).toMatch(/°$/)
    await page.screenshot({ path: screenshotPath('workspace-construct-check') })
    expect(await sourceTagsShown(page, '.results')).toEqual([])
    await page.close()
  })

  it('shows Motion pair with the flexion and extension films side by side', async () => {
    const flexion = await uploadPhantom('motion-flexion', 'lateral-flexion')
    const extension = await uploadPhantom('motion-extension', 'lateral-extension')
    const names = templateLandmarks('motion-pair', { segment: 'L4-L5' }).map((spec) => spec.name)
    const pick = (doc: LandmarkDocument) =>
      Object.fromEntries(names.map((name) => [name, doc.points[name]!]))
    const reading = await createReading(flexion.image.id, {
      template: 'motion-pair',
      options: { segment: 'L4-L5' },
      pairedImageId: extension.image.id,
      points: pick(flexion.truth),
    })
    const patched = await browser.request.patch(`${server.url}/api/readings/${reading.id}`, {
      data: {
        points: pick(flexion.truth),
        pairedPoints: pick(extension.truth),
        version: reading.version,
      },
    })
    expect(await statusWithBody(patched)).toBe(200)
    const page = await browser.newPage()
    await openWorkspace(page, reading.id)
    await page.locator('[data-testid="film-canvas"][data-side="paired"] canvas').first().waitFor()
    await page.locator('[data-result="rom"]').waitFor()
    // The phantom pair turns L4-L5 through 14° (server/phantom/presets.ts, motion preset).
    const rom = parseNumber(await resultValue(page, 'rom'))
    expect(Math.abs(rom - 14)).toBeLessThan(0.5)
    await page.screenshot({ path: screenshotPath('workspace-motion-pair') })
    expect(await sourceTagsShown(page, '.results')).toEqual([])
    await page.close()
  })
})

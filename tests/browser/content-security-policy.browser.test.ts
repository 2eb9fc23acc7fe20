import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import type { Db } from '../../server/db/knex'
import type { ImageRecord } from '../../shared/types/api'
import type { Reading } from '../../shared/types/readings'
import type { Role } from '../../shared/types/domain'
import { templateLandmarks } from '../../shared/readings/templates'
import { openTestDb, truncateAll } from '../support/test-db'
import { createUsersForEveryRole, testConfig, type TestUser } from '../support/test-app'
import { insertStudyWith, insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'
import { launchBrowser, startAppServer } from '../support/browser'

let db: Db
let browser: BrowserContext
let server: { url: string; close(): Promise<void> }
let users: Record<Role, TestUser>
let patientId: number
let studyId: number
let readings: Reading[] = []

/** Uploads a phantom film to a visit and files a submitted reading of its true landmarks. */
async function filmWithReading(visitId: number, user: TestUser): Promise<Reading> {
  const files = await smallPhantomFiles({})
  const headers = { cookie: user.cookie }
  const upload = await browser.request.post(`${server.url}/api/visits/${visitId}/images`, {
    headers,
    multipart: {
      view: 'lateral-neutral',
      confirmPatientMismatch: 'true',
      file: { name: 'film.dcm', mimeType: 'application/dicom', buffer: files.dicom },
    },
  })
  expect(upload.status()).toBe(201)
  const [image] = (await upload.json()) as ImageRecord[]
  const points = Object.fromEntries(
    templateLandmarks('lumbar-alignment').map((spec) => [
      spec.name,
      files.film.landmarks.points[spec.name]!,
    ]),
  )
  const created = await browser.request.post(`${server.url}/api/images/${image!.id}/readings`, {
    headers,
    data: { template: 'lumbar-alignment', points },
  })
  expect(created.status()).toBe(201)
  const reading = (await created.json()) as Reading
  const submitted = await browser.request.post(`${server.url}/api/readings/${reading.id}/submit`, {
    headers,
    data: { version: reading.version },
  })
  expect(submitted.status()).toBe(200)
  return (await submitted.json()) as Reading
}

beforeAll(async () => {
  db = await openTestDb()
  await truncateAll(db)
  users = await createUsersForEveryRole(db, testConfig())
  patientId = await insertTestPatient(db, users.surgeon.id, { familyName: 'Vantongeren' })
  const preOp = await insertTestVisit(db, patientId, users.surgeon.id, '2026-01-12', 'pre-op')
  const postOp = await insertTestVisit(db, patientId, users.surgeon.id, '2026-05-04', 'post-op')
  studyId = await insertStudyWith(db, users.researcher.id, [patientId])
  server = await startAppServer(db)
  browser = await launchBrowser()
  readings = [
    await filmWithReading(preOp, users.surgeon),
    await filmWithReading(postOp, users.surgeon),
  ]
})

afterAll(async () => {
  await browser?.close()
  await server?.close()
  await db?.destroy()
})

interface Violation {
  directive: string
  blocked: string
  sample: string
}

/**
 * Opens a screen as a role and answers every CSP violation it raised: the page's
 * securitypolicyviolation events (CSP Level 3, §5.3) and Chromium's console reports of them.
 */
async function violationsOn(
  role: Role | null,
  path: string,
  ready: (page: Page) => Promise<unknown>,
): Promise<Array<Violation | string>> {
  await browser.clearCookies()
  if (role) {
    const [name, value] = users[role].cookie.split('=') as [string, string]
    await browser.addCookies([{ name, value, url: server.url }])
  }
  const page = await browser.newPage()
  // Plain script text: this file is type-checked without the DOM library.
  await page.addInitScript({
    content: `window.cspViolations = [];
      document.addEventListener('securitypolicyviolation', (event) => window.cspViolations.push({
        directive: event.effectiveDirective, blocked: event.blockedURI, sample: event.sample,
      }));`,
  })
  const consoleReports: string[] = []
  page.on('console', (message) => {
    if (message.type() === 'error' && /Content Security Policy/i.test(message.text()))
      consoleReports.push(message.text())
  })
  try {
    await page.goto(`${server.url}${path}`)
    await ready(page)
    await page.waitForLoadState('networkidle')
    const events = (await page.evaluate('window.cspViolations')) as Violation[]
    return [...events, ...consoleReports]
  } finally {
    await page.close()
  }
}

const heading = (page: Page) => page.locator('main h1, main h2').first().waitFor()
const canvas = (page: Page) => page.locator('canvas').first().waitFor()

describe('every screen under a style-src without unsafe-inline', () => {
  it('raises no CSP violation on any screen, as each role that sees it', async () => {
    const [first, second] = readings as [Reading, Reading]
    const screens: Array<[Role | null, string, (page: Page) => Promise<unknown>]> = [
      [null, '/sign-in', (page) => page.getByRole('button', { name: 'Sign in' }).waitFor()],
      ['surgeon', '/', heading],
      ['fellow', '/', heading],
      ['researcher', '/', heading],
      ['admin', '/', heading],
      ['surgeon', '/patients', heading],
      ['surgeon', `/patients/${patientId}`, heading],
      ['surgeon', `/readings/${first.id}`, canvas],
      [
        'surgeon',
        `/patients/${patientId}/compare?images=${first.imageId},${second.imageId}`,
        canvas,
      ],
      ['surgeon', `/readings/${first.id}/report`, (page) => page.locator('.report-page').waitFor()],
      [
        'surgeon',
        `/patients/${patientId}/compare/print?images=${first.imageId},${second.imageId}`,
        (page) => page.locator('.report-page').waitFor(),
      ],
      ['surgeon', '/studies', heading],
      ['researcher', `/studies/${studyId}`, heading],
      ['admin', '/administration', heading],
      ['admin', '/mail', heading],
    ]
    const found: Record<string, Array<Violation | string>> = {}
    for (const [role, path, ready] of screens) {
      const violations = await violationsOn(role, path, ready)
      if (violations.length > 0) found[`${role ?? 'signed out'} ${path}`] = violations
    }
    expect(found).toEqual({})
  })
})

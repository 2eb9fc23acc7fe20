import { existsSync, mkdirSync } from 'node:fs'
import { createServer, type Server } from 'node:http'
import { join } from 'node:path'
import type { BrowserContext, ConsoleMessage, Page } from 'playwright-core'
import { launchHeadlessChromium } from '../../server/cli/chromium'
import { pino } from 'pino'
import { createApp } from '../../server/app'
import type { Db } from '../../server/db/knex'
import { projectRoot } from '../../server/project-root'
import { testConfig } from './test-app'
import { asSameOriginClient } from './scripted-client'

export const SCREENSHOT_DIR = join(projectRoot, 'tests', 'output')

/** Debian's Chromium driven by playwright-core; no browser download ever happens. */
export function launchBrowser(): Promise<BrowserContext> {
  return launchHeadlessChromium()
}

/** Serves the built client and the API on a free port of 127.0.0.1. */
export async function startAppServer(db: Db): Promise<{ url: string; close(): Promise<void> }> {
  const clientDir = join(projectRoot, 'dist')
  if (!existsSync(join(clientDir, 'index.html'))) {
    throw new Error(
      'The client is not built: run `npx vite build` (npm test does it) before the browser tests.',
    )
  }
  // The browser labels its own requests; the set-up writes a test sends with supertest are marked.
  const app = asSameOriginClient(
    createApp({ db, config: testConfig(), logger: pino({ level: 'silent' }), clientDir }),
  )
  const server: Server = createServer(app)
  await new Promise<void>((resolveListen) => server.listen(0, '127.0.0.1', () => resolveListen()))
  const address = server.address()
  if (!address || typeof address === 'string') throw new Error('No port')
  return {
    url: `http://127.0.0.1:${address.port}`,
    async close() {
      server.closeAllConnections()
      await new Promise<void>((resolveClose) => server.close(() => resolveClose()))
    },
  }
}

export function screenshotPath(name: string): string {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  return join(SCREENSHOT_DIR, `${name}.png`)
}

/**
 * Signs in through the sign-in screen, from a signed-out state (one persistent profile serves
 * every test of a file, so cookies are cleared first). The signed-out sign-in page must leave the
 * browser console clean: the first "who is signed in" question is answered without an error.
 */
export async function signInThroughForm(
  browser: BrowserContext,
  page: Page,
  baseUrl: string,
  user: { email: string; password: string },
): Promise<void> {
  await browser.clearCookies()
  const consoleErrors: string[] = []
  const noteError = (message: ConsoleMessage) => {
    if (message.type() === 'error') consoleErrors.push(message.text())
  }
  page.on('console', noteError)
  const askedWhoIsSignedIn = page.waitForResponse((res) => res.url().endsWith('/api/auth/me'))
  await page.goto(`${baseUrl}/sign-in`)
  const me = await askedWhoIsSignedIn
  await page.getByLabel('E-mail').waitFor()
  page.off('console', noteError)
  if (me.status() !== 200 || consoleErrors.length > 0)
    throw new Error(
      `The signed-out sign-in page was not clean: /api/auth/me answered ${me.status()}; console: ${consoleErrors.join(' | ')}`,
    )
  await page.getByLabel('E-mail').fill(user.email)
  await page.locator('#password').fill(user.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/** From the worklist every role lands on, the Patients screen through the main menu. */
export async function openPatientsFromMenu(page: Page): Promise<void> {
  await page.getByRole('heading', { name: 'Worklist' }).waitFor()
  await page
    .getByRole('navigation', { name: 'Main' })
    .getByRole('link', { name: 'Patients' })
    .click()
  await page.getByRole('heading', { name: 'Patients' }).waitFor()
}

/**
 * The evidence tags of the engine's sources ([V], [V-sec], [M], [D], "[V for …; M for …]") are
 * for the code: none may reach a screen, in its text or in a tooltip. Reads the HTML of what
 * `selector` matches (every match), attributes included.
 */
export async function sourceTagsShown(page: Page, selector: string): Promise<string[]> {
  const html = await page.locator(selector).evaluateAll((nodes) => nodes.map((n) => n.outerHTML))
  return html.join('\n').match(/\[(?:V|M|D|V-sec)(?:\]|\s+for\b)[^\]]*\]?/g) ?? []
}

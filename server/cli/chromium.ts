import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext } from 'playwright-core'

/**
 * Debian's Chromium driven by playwright-core, for browser tests, benchmarks and screenshots;
 * no browser is ever downloaded. The background-networking flags keep a headless run from
 * calling out on a machine that has no network but the package registries.
 */
export async function launchHeadlessChromium(
  viewport = { width: 1440, height: 900 },
): Promise<BrowserContext> {
  return chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), 'endplate-chromium-')), {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  })
}

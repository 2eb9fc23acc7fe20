import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { pino } from 'pino'
import type { Express } from 'express'
import { createApp } from '../../server/app'
import type { Db } from '../../server/db/knex'
import { CSP_NONCE_PLACEHOLDER } from '../../server/middleware/csp-nonce'
import { openTestDb } from '../support/test-db'
import { testConfig } from '../support/test-app'

let db: Db
let app: Express
let clientDir: string

// A page as Vite writes it with html.cspNonce set (the meta tag and nonce attributes are Vite's).
const INDEX_HTML = `<!doctype html><html><head>
<meta property="csp-nonce" nonce="${CSP_NONCE_PLACEHOLDER}">
<script type="module" crossorigin src="/assets/index.js" nonce="${CSP_NONCE_PLACEHOLDER}"></script>
<link rel="stylesheet" crossorigin href="/assets/index.css" nonce="${CSP_NONCE_PLACEHOLDER}">
</head><body><div id="app"></div></body></html>`

beforeAll(async () => {
  db = await openTestDb()
  clientDir = mkdtempSync(join(tmpdir(), 'endplate-csp-'))
  mkdirSync(join(clientDir, 'assets'))
  writeFileSync(join(clientDir, 'index.html'), INDEX_HTML)
  writeFileSync(join(clientDir, 'assets', 'index.js'), 'export {}')
  app = createApp({ db, config: testConfig(), logger: pino({ level: 'silent' }), clientDir })
})

afterAll(async () => {
  rmSync(clientDir, { recursive: true, force: true })
  await db?.destroy()
})

/** The source list of one directive of a Content-Security-Policy header (CSP Level 3, §2.2). */
function directive(header: string, name: string): string[] {
  const found = header
    .split(';')
    .map((part) => part.trim().split(/\s+/))
    .find(([directiveName]) => directiveName === name)
  return found ? found.slice(1) : []
}

function nonceOf(sources: string[]): string | undefined {
  return sources.map((source) => /^'nonce-([A-Za-z0-9+/=]+)'$/.exec(source)?.[1]).find(Boolean)
}

describe('Content-Security-Policy of the client page', () => {
  it("allows styles by this response's nonce, never 'unsafe-inline', and writes it into the page", async () => {
    for (const path of ['/', '/patients/12', '/index.html']) {
      const response = await request(app).get(path).expect(200)
      const header = response.headers['content-security-policy'] as string
      const styleSources = directive(header, 'style-src')
      expect(styleSources).not.toContain("'unsafe-inline'")
      expect(directive(header, 'script-src')).not.toContain("'unsafe-inline'")
      const nonce = nonceOf(styleSources)
      // 16 random bytes in base64 (CSP Level 3 asks for at least 128 bits).
      expect(nonce).toMatch(/^[A-Za-z0-9+/]{22}==$/)
      expect(response.text).not.toContain(CSP_NONCE_PLACEHOLDER)
      expect(response.text).toContain(`<meta property="csp-nonce" nonce="${nonce}">`)
      expect(response.text).toContain(`src="/assets/index.js" nonce="${nonce}"`)
      expect(response.headers['cache-control']).toBe('no-cache')
    }
  })

  it('gives every response a nonce of its own', async () => {
    const nonces = new Set<string | undefined>()
    for (let i = 0; i < 5; i += 1) {
      const response = await request(app).get('/').expect(200)
      nonces.add(
        nonceOf(directive(response.headers['content-security-policy'] as string, 'style-src')),
      )
    }
    expect(nonces.size).toBe(5)
  })
})

import { describe, expect, it } from 'vitest'
import { parseConfig } from '../../../server/config'
import { demoRequested } from '../../../server/cli/demo-seed'

// A complete, valid environment; each case spoils one key.
const GOOD = {
  DB_PASSWORD: 'a-random-database-password',
  DB_OWNER_PASSWORD: 'a-random-owner-password',
  JWT_SECRET: 'Zx8sQm1dJ4vPq0bT7yKc2nWf5hLr9aEu3gVo6iXs1Mk', // 43 base64url characters
  MAIL_FAKE: 'true',
  NODE_ENV: 'development',
}

function problemsOf(env: Record<string, string>): string {
  try {
    parseConfig(env)
    return ''
  } catch (error) {
    return (error as Error).message
  }
}

describe('the session key', () => {
  it('is refused while it is the .env.example placeholder, naming JWT_SECRET', () => {
    // The placeholder value as .env.example ships it.
    expect(problemsOf({ ...GOOD, JWT_SECRET: 'change-me-to-a-long-random-string' })).toMatch(
      /JWT_SECRET is still the placeholder/,
    )
  })

  it('is refused under 32 bytes of randomness (43 base64url characters)', () => {
    // RFC 7518 §3.2: an HS256 key has at least 256 bits.
    expect(problemsOf({ ...GOOD, JWT_SECRET: 'x'.repeat(42) })).toMatch(/JWT_SECRET is too short/)
    expect(problemsOf({ ...GOOD, JWT_SECRET: 'a'.repeat(64) })).toBe('')
    expect(problemsOf(GOOD)).toBe('')
  })

  it('refuses the database password placeholders, naming DB_PASSWORD and DB_OWNER_PASSWORD', () => {
    expect(problemsOf({ ...GOOD, DB_PASSWORD: 'change-me-local-only' })).toMatch(/DB_PASSWORD/)
    expect(problemsOf({ ...GOOD, DB_OWNER_PASSWORD: 'change-me-local-only' })).toMatch(
      /DB_OWNER_PASSWORD/,
    )
  })
})

describe('production defaults', () => {
  it('refuses NODE_ENV=production with the local fake mail server on', () => {
    expect(problemsOf({ ...GOOD, NODE_ENV: 'production' })).toMatch(/MAIL_FAKE/)
    expect(problemsOf({ ...GOOD, NODE_ENV: 'production', MAIL_FAKE: 'false' })).toBe('')
  })

  it('seeds the demo only when asked, and never in production', () => {
    expect(demoRequested(['node', 'start.ts'], 'development')).toBe(false)
    expect(demoRequested(['node', 'start.ts', '--demo'], 'development')).toBe(true)
    expect(demoRequested(['node', 'start.ts', '--demo'], 'production')).toBe(false)
  })
})

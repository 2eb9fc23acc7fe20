import { randomBytes } from 'node:crypto'
import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { projectRoot } from '../project-root'

const PLACEHOLDER_KEYS = ['JWT_SECRET', 'DB_PASSWORD', 'DB_OWNER_PASSWORD'] as const

/**
 * Writes .env from .env.example on first start, with random values for the session secret and the
 * database passwords, and fills those in when an existing .env lacks them (an .env written
 * before the schema owner account existed gets DB_OWNER_PASSWORD added). Must run before
 * server/config is imported, since that module reads .env once.
 */
export function ensureEnvFile(): void {
  const envPath = resolve(projectRoot, '.env')
  const example = readFileSync(resolve(projectRoot, '.env.example'), 'utf8')
  let text = existsSync(envPath) ? readFileSync(envPath, 'utf8') : example
  let changed = !existsSync(envPath)
  for (const key of PLACEHOLDER_KEYS) {
    const line = new RegExp(`^${key}=(.*)$`, 'm')
    const current = line.exec(text)?.[1]?.trim()
    if (current && !current.startsWith('change-me')) continue
    const secret = randomBytes(32).toString('base64url')
    text = line.test(text)
      ? text.replace(line, `${key}=${secret}`)
      : `${text.trimEnd()}\n${key}=${secret}\n`
    changed = true
  }
  if (changed) {
    writeFileSync(envPath, text, { mode: 0o600 })
    console.log('Wrote .env with a random session secret and database passwords.')
  }
}

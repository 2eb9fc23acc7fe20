import bcrypt from 'bcryptjs'
import { pino } from 'pino'
import type { Express } from 'express'
import { createApp } from '../../server/app'
import { parseConfig, type AppConfig } from '../../server/config'
import type { Db } from '../../server/db/knex'
import { insertUser } from '../../server/db/users'
import { signSessionToken, tokenSettingsOf } from '../../server/auth/session-token'
import { SESSION_COOKIE } from '../../server/auth/session-token'
import type { Role } from '../../shared/types/domain'
import type { Clock } from '../../server/clock'
import { asSameOriginClient } from './scripted-client'

export function testConfig(overrides: Record<string, string> = {}): AppConfig {
  return parseConfig({
    ...process.env,
    NODE_ENV: 'test',
    LOG_LEVEL: 'silent',
    LOGIN_RATE_LIMIT_PER_MINUTE: '1000',
    LOGIN_ATTEMPTS_PER_ACCOUNT_HOUR: '1000',
    ...overrides,
  })
}

/**
 * The app as API tests reach it. `bare: true` gives the app without the same-origin marking of
 * scripted requests (see asSameOriginClient), for the tests of the cross-site check itself.
 */
export function buildTestApp(
  db: Db,
  overrides: Record<string, string> = {},
  dependencies: { now?: Clock; bare?: boolean } = {},
): { app: Express; config: AppConfig } {
  const config = testConfig(overrides)
  const { bare = false, ...appDependencies } = dependencies
  // No built client in API tests: the app serves the API only.
  const app = createApp({
    db,
    config,
    logger: pino({ level: 'silent' }),
    clientDir: '/nonexistent',
    ...appDependencies,
  })
  return { app: bare ? app : asSameOriginClient(app), config }
}

/** A clock that stands still until a test moves it (link expiry, mail retries). */
export function movableClock(start = new Date()): Clock & { advanceMs(ms: number): void } {
  let nowMs = start.getTime()
  const clock = () => new Date(nowMs)
  clock.advanceMs = (ms: number) => {
    nowMs += ms
  }
  return clock
}

export interface TestUser {
  id: number
  email: string
  password: string
  role: Role
  cookie: string
}

// bcrypt at cost 4 keeps test set-up fast; the cost is read from the hash, so sign-in still works.
export async function createTestUser(
  db: Db,
  config: AppConfig,
  role: Role,
  email = `${role}@test.example`,
): Promise<TestUser> {
  const password = `pw-${role}-correct`
  const id = await insertUser(db, {
    email,
    displayName: `Test ${role}`,
    role,
    passwordHash: await bcrypt.hash(password, 4),
  })
  const token = signSessionToken(id, role, tokenSettingsOf(config))
  return { id, email, password, role, cookie: `${SESSION_COOKIE}=${token}` }
}

export async function createUsersForEveryRole(
  db: Db,
  config: AppConfig,
): Promise<Record<Role, TestUser>> {
  return {
    admin: await createTestUser(db, config, 'admin'),
    surgeon: await createTestUser(db, config, 'surgeon'),
    fellow: await createTestUser(db, config, 'fellow'),
    researcher: await createTestUser(db, config, 'researcher'),
  }
}

import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp } from '../support/test-app'
import { registeredRoutes, type RegisteredRoute } from '../support/route-table'
import { INPUT_CASES } from './bad-input/cases'
import { buildWorld, type World } from './bad-input/world'
import { attemptsFor, type Attempt } from './bad-input/mutations'
import { refusalReason, roleMayCall, type Who } from './bad-input/expectation'
import { leakIn } from './bad-input/leaks'
import {
  changedTables,
  fingerprint,
  tablesToWatch,
  type Fingerprint,
} from './bad-input/db-fingerprint'
import { seededSample } from './bad-input/sample'
import { printLine } from '../support/print-line'

/**
 * Bad input over every route the app registers, as every role and anonymous. Each answer is a
 * 4xx with a message unless the input is valid for that caller; none is a 5xx; no body carries a
 * stack trace or SQL; and a refused request leaves every table as it was.
 */
const WHO: Who[] = ['anonymous', 'admin', 'surgeon', 'fellow', 'researcher']
// The full cross product is ~20 000 requests; a fixed seed keeps the sample the same every run.
const SEED = 20261202
const PER_ROUTE_AND_ROLE = { mayCall: 45, mayNot: 6 }

let db: Db
let app: Express
let config: AppConfig
let server: Server
let origin: string
let world: World
let routes: RegisteredRoute[]

beforeAll(async () => {
  db = await openTestDb()
  ;({ app, config } = buildTestApp(db))
  await truncateAll(db)
  world = await buildWorld(db, app, config)
  // The routes are read off the bare app: the one requests go to wraps it to label scripted
  // writes as same-origin, and a wrapped app's router is out of reach.
  routes = registeredRoutes(buildTestApp(db, {}, { bare: true }).app)
  server = createServer(app)
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`
})
afterAll(async () => {
  await new Promise<void>((resolve) => server.close(() => resolve()))
  await db.destroy()
})

function urlOf(route: RegisteredRoute, attempt: Attempt): string {
  const path = route.path.replace(/:(\w+)/g, (_m, name: string) => attempt.params[name] ?? '')
  return attempt.query ? `${path}?${attempt.query}` : path
}

/** Sent with fetch, so raw bodies go out byte for byte (supertest re-serialises a Buffer as JSON). */
async function send(
  route: RegisteredRoute,
  who: Who,
  attempt: Attempt,
): Promise<{ status: number; text: string }> {
  const headers: Record<string, string> = { Origin: origin }
  if (who !== 'anonymous') headers.Cookie = world.users[who].cookie
  let body: Buffer | undefined
  if (attempt.body.kind === 'json') {
    headers['Content-Type'] = 'application/json'
    body = Buffer.from(JSON.stringify(attempt.body.value))
  } else if (attempt.body.kind === 'raw') {
    headers['Content-Type'] = attempt.body.contentType
    body = attempt.body.bytes
  }
  const res = await fetch(`${origin}${urlOf(route, attempt)}`, {
    method: route.method.toUpperCase(),
    headers,
    body,
    redirect: 'manual',
  })
  // Read every answer as text, so the leak check sees the bytes as they went out.
  return { status: res.status, text: await res.text() }
}

/** Routes that end sessions or remove records run last, so they cannot take the others' rows away. */
function runOrder(route: RegisteredRoute): number {
  if (route.key === 'POST /api/auth/logout') return 2
  return route.method === 'delete' ? 1 : 0
}

describe('bad input over every route', () => {
  it('has input cases for every registered route, and none for a route that is gone', () => {
    const keys = new Set(routes.map((route) => route.key))
    expect(routes.filter((route) => !INPUT_CASES[route.key]).map((route) => route.key)).toEqual([])
    expect(Object.keys(INPUT_CASES).filter((key) => !keys.has(key))).toEqual([])
  })

  it('refuses what is wrong with a 4xx and a message, never a 5xx or a leak, and changes nothing it refused', async () => {
    const failures: string[] = []
    const perStatus = new Map<number, number>()
    let tried = 0
    let generated = 0
    const tables = await tablesToWatch(db)
    let before: Fingerprint = await fingerprint(db, tables)
    const ordered = [...routes].sort((a, b) => runOrder(a) - runOrder(b))

    for (const route of ordered) {
      const inputCase = INPUT_CASES[route.key]
      if (!inputCase) continue
      for (const who of WHO) {
        const baseline = {
          path: route.path,
          params: inputCase.params?.(world) ?? {},
          query: inputCase.query?.(world) ?? {},
          queryKeys: queryKeysOf(route),
          body: (await inputCase.body?.(world)) ?? {},
          multipart: inputCase.multipart === true,
          hasBody: inputCase.body !== undefined,
        }
        const all = attemptsFor(baseline, world)
        generated += all.length
        const cap = roleMayCall(route, who) ? PER_ROUTE_AND_ROLE.mayCall : PER_ROUTE_AND_ROLE.mayNot
        // The listed valid request always goes first; the rest are sampled.
        const chosen = [
          all[0] as Attempt,
          ...seededSample(all.slice(1), cap - 1, `${SEED}${route.key}${who}`),
        ]
        let refusedSinceCheck: string[] = []
        for (const attempt of chosen) {
          const reason = refusalReason(route, who, attempt)
          const where = `${route.key} as ${who}, ${attempt.label}`
          if (reason === null && refusedSinceCheck.length > 0) {
            // A valid write may change rows: first make sure the refusals before it did not.
            const now = await fingerprint(db, tables)
            const changed = changedTables(before, now)
            if (changed.length)
              failures.push(
                `${route.key} as ${who}: a refused request changed ${changed.join(', ')} (one of: ${refusedSinceCheck.join('; ')})`,
              )
            refusedSinceCheck = []
          }
          const res = await send(route, who, attempt)
          tried += 1
          perStatus.set(res.status, (perStatus.get(res.status) ?? 0) + 1)
          const text = res.text
          const leak = leakIn(text)
          if (leak) failures.push(`${where}: ${leak} in the answer: ${text.slice(0, 200)}`)
          if (res.status >= 500) failures.push(`${where}: ${res.status} ${text.slice(0, 200)}`)
          else if (reason !== null && res.status < 400)
            failures.push(`${where}: ${res.status} although it should be refused (${reason})`)
          if (res.status >= 400 && !hasMessage(text))
            failures.push(`${where}: ${res.status} without a message: ${text.slice(0, 200)}`)
          if (reason === null) before = await fingerprint(db, tables)
          else refusedSinceCheck.push(attempt.label)
        }
        if (refusedSinceCheck.length > 0) {
          const now = await fingerprint(db, tables)
          const changed = changedTables(before, now)
          if (changed.length)
            failures.push(
              `${route.key} as ${who}: a refused request changed ${changed.join(', ')} (one of: ${refusedSinceCheck.join('; ')})`,
            )
          before = now
        }
      }
    }

    const statuses = [...perStatus.entries()]
      .sort(([a], [b]) => a - b)
      .map(([s, n]) => `${s}: ${n}`)
    printLine(
      `bad input: ${tried} requests tried over ${routes.length} routes × ${WHO.length} callers ` +
        `(sampled with seed ${SEED}: up to ${PER_ROUTE_AND_ROLE.mayCall} per route and caller allowed to call it, ` +
        `${PER_ROUTE_AND_ROLE.mayNot} per caller refused outright, out of ${generated} generated); by status ${statuses.join(', ')}`,
    )
    // One line per kind of failure (the same label on many routes is one finding), then the count.
    const kinds = new Map<string, string>()
    for (const failure of failures) kinds.set(failure.replace(/^\S+ \S+ as \w+/, ''), failure)
    expect({ failures: failures.length, examples: [...kinds.values()].slice(0, 60) }).toEqual({
      failures: 0,
      examples: [],
    })
  }, 600_000)
})

function hasMessage(text: string): boolean {
  try {
    const body = JSON.parse(text) as { error?: { message?: unknown } }
    return typeof body.error?.message === 'string' && body.error.message.length > 0
  } catch {
    return false
  }
}

/** Keys the route's query schemas name (zod objects expose their shape). */
function queryKeysOf(route: RegisteredRoute): string[] {
  return (route.schemas.query ?? []).flatMap((schema) => {
    const shape = (schema as unknown as { shape?: Record<string, unknown> }).shape
    return shape ? Object.keys(shape) : []
  })
}

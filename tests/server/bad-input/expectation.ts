import { parse as parseQueryString } from 'node:querystring'
import type { ZodType } from 'zod'
import type { Role } from '../../../shared/types/domain'
import { roleCan } from '../../../shared/types/permissions'
import type { RegisteredRoute } from '../../support/route-table'
import type { Attempt } from './mutations'

export type Who = Role | 'anonymous'

export function roleMayCall(route: RegisteredRoute, who: Who): boolean {
  if (who === 'anonymous') return !route.session && route.permissions.length === 0
  return route.permissions.every((permission) => roleCan(who, permission))
}

function passes(schemas: ZodType[] | undefined, value: unknown): boolean {
  return (schemas ?? []).every((schema) => schema.safeParse(value).success)
}

function decodedParams(params: Record<string, string>): Record<string, string> | null {
  try {
    return Object.fromEntries(Object.entries(params).map(([k, v]) => [k, decodeURIComponent(v)]))
  } catch {
    return null
  }
}

/**
 * Why this attempt must be refused for this caller, or null when it is valid input for them (then
 * a 2xx is allowed, and so is a 4xx the service gives, such as 409 for a stale version). The
 * route's own schemas judge what is well-formed; the attempt says what is wrong whatever they say.
 */
export function refusalReason(route: RegisteredRoute, who: Who, attempt: Attempt): string | null {
  if (!roleMayCall(route, who)) return `${who} may not call it`
  if (attempt.mustRefuse) return attempt.mustRefuse
  if (who !== 'anonymous' && attempt.mustRefuseFor?.includes(who)) return `not ${who}'s to see`
  const params = decodedParams(attempt.params)
  if (!params || !passes(route.schemas.params, params)) return 'path parameters fail their schema'
  // Express 5's default ("simple") query parser is node:querystring.
  if (!passes(route.schemas.query, { ...parseQueryString(attempt.query) }))
    return 'query fails its schema'
  if (attempt.body.kind === 'raw') return null
  if (attempt.body.kind === 'json' && !passes(route.schemas.body, attempt.body.value))
    return 'body fails its schema'
  return null
}

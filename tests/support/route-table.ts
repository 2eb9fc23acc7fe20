import type { Express } from 'express'
import type { ZodType } from 'zod'
import { tagOf } from '../../server/middleware/handler-tags'
import type { Permission } from '../../shared/types/permissions'

/** One route as the app registered it, with what its middleware checks before the handler. */
export interface RegisteredRoute {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete'
  /** Full path with Express parameters, e.g. /api/patients/:id. */
  path: string
  /** `${METHOD} ${path}`, the key the input cases are listed under. */
  key: string
  session: boolean
  permissions: Permission[]
  schemas: Partial<Record<'body' | 'query' | 'params', ZodType[]>>
}

interface Layer {
  rawPath?: unknown
  handle: { stack?: Layer[] } & object
  route?: { path: string; methods: Record<string, boolean>; stack: Layer[] }
}

interface Guards {
  session: boolean
  permissions: Permission[]
  schemas: RegisteredRoute['schemas']
}

function withHandler(guards: Guards, handler: unknown): Guards {
  const tag = tagOf(handler)
  if (!tag) return guards
  const schemas = { ...guards.schemas }
  if (tag.validates)
    schemas[tag.validates.part] = [...(schemas[tag.validates.part] ?? []), tag.validates.schema]
  return {
    session: guards.session || tag.session === true,
    permissions: tag.permission ? [...guards.permissions, tag.permission] : guards.permissions,
    schemas,
  }
}

function walk(stack: Layer[], prefix: string, inherited: Guards, out: RegisteredRoute[]): void {
  // Middleware mounted without a path (router.use(handler)) guards every layer after it.
  let guards = inherited
  for (const layer of stack) {
    if (layer.route) {
      const own = layer.route.stack.reduce(
        (acc, handler) => withHandler(acc, handler.handle),
        guards,
      )
      const path = `${prefix}${layer.route.path}`.replace(/(.)\/$/, '$1')
      for (const method of Object.keys(layer.route.methods)) {
        if (method === '_all') continue
        out.push({
          method: method as RegisteredRoute['method'],
          path,
          key: `${method.toUpperCase()} ${path}`,
          ...own,
        })
      }
    } else if (layer.handle.stack) {
      const mount =
        layer.rawPath === '/' || layer.rawPath === undefined ? '' : String(layer.rawPath)
      walk(layer.handle.stack, prefix + mount, guards, out)
    } else {
      guards = withHandler(guards, layer.handle)
    }
  }
}

/** Every route of the app, read from Express's own router stack. */
export function registeredRoutes(app: Express): RegisteredRoute[] {
  const out: RegisteredRoute[] = []
  const router = (app as unknown as { router: { stack: Layer[] } }).router
  walk(router.stack, '', { session: false, permissions: [], schemas: {} }, out)
  return out
}

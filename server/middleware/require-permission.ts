import type { RequestHandler } from 'express'
import { forbidden, unauthorized } from '../errors'
import { tagHandler } from './handler-tags'
import { roleCan, type Permission } from '../../shared/types/permissions'

/** Refuses the request unless the signed-in user's role holds the permission. */
export function requirePermission(permission: Permission): RequestHandler {
  return tagHandler(
    (req, _res, next) => {
      if (!req.user) throw unauthorized()
      if (!roleCan(req.user.role, permission)) throw forbidden()
      next()
    },
    { permission },
  )
}

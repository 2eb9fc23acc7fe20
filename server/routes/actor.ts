import type { Request } from 'express'
import { unauthorized } from '../errors'
import type { Actor } from '../services/audit'

/** The signed-in user and address of a request, as services expect them. */
export function actorOf(req: Request): Actor {
  if (!req.user) throw unauthorized()
  return { user: req.user, ip: req.ip ?? null, readAudited: req.readAudited }
}

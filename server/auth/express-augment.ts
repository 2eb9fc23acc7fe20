import type { SessionUser } from '../../shared/types/api'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set by `authenticate` once the session token and the account have been checked. */
      user?: SessionUser
    }
  }
}

export {}

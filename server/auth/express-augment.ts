import type { SessionUser } from '../../shared/types/api'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set by `authenticate` once the session token and the account have been checked. */
      user?: SessionUser
      /** The sign-in this request belongs to; its expiry is the current token's. */
      session?: { id: string; expiresAt: Date; signedInAt: Date }
      /** Set once the request's read has been audited on arrival (middleware/audit-reads.ts). */
      readAudited?: { recorded: boolean }
    }
  }
}

export {}

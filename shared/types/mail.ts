/** A message caught by the local fake mail server (development, demo and tests only). */
export interface CaughtMail {
  id: number
  to: string
  subject: string
  text: string
  receivedAt: string
}

/** A mail the outbox has not delivered yet, as the administrator sees it (never its body). */
export interface UndeliveredMail {
  id: number
  to: string
  subject: string
  /** pending: still being retried; failed: retries used up, waits for "send again". */
  status: 'pending' | 'failed'
  attempts: number
  lastError: string | null
  nextAttemptAt: string | null
  createdAt: string
}

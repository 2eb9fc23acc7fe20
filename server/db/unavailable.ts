/**
 * Whether an error means "the database cannot be reached or did not answer in time" (as opposed
 * to a bad statement): such a request is answered 503 with Retry-After, and the next one may
 * well succeed once MariaDB is back. Codes are mysql2's and MariaDB's (MariaDB Server error
 * codes: 1040 ER_CON_COUNT_ERROR, 1053 ER_SERVER_SHUTDOWN, 1927 ER_CONNECTION_KILLED,
 * 1969 ER_STATEMENT_TIMEOUT) and Node's socket errors.
 */
const UNREACHABLE_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'EAI_AGAIN',
  'PROTOCOL_CONNECTION_LOST',
  'PROTOCOL_SEQUENCE_TIMEOUT',
  'PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR',
  'PROTOCOL_ENQUEUE_AFTER_QUIT',
  'ER_CON_COUNT_ERROR',
  'ER_SERVER_SHUTDOWN',
  'ER_CONNECTION_KILLED',
  'ER_STATEMENT_TIMEOUT',
  'ER_QUERY_INTERRUPTED',
])

/** Two writers waited on each other's row locks: the loser may simply try again. */
const CONTENTION_CODES = new Set(['ER_LOCK_WAIT_TIMEOUT', 'ER_LOCK_DEADLOCK'])

interface DriverError {
  code?: string
  name?: string
  fatal?: boolean
}

export function isDatabaseUnreachable(error: unknown): boolean {
  if (typeof error !== 'object' || error === null) return false
  const { code, name, fatal } = error as DriverError
  // Knex's "Timeout acquiring a connection. The pool is probably full."
  if (name === 'KnexTimeoutError') return true
  if (code !== undefined && UNREACHABLE_CODES.has(code)) return true
  // mysql2 marks errors that closed the connection as fatal (a lost or refused server).
  return fatal === true && !(code !== undefined && code.startsWith('ER_'))
}

export function isLockContention(error: unknown): boolean {
  const code = typeof error === 'object' && error !== null ? (error as DriverError).code : undefined
  return code !== undefined && CONTENTION_CODES.has(code)
}

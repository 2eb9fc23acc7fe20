import { pino, stdSerializers, type DestinationStream, type Logger } from 'pino'

/**
 * Paths pino censors in every log line. Cookies and tokens are credentials; the database
 * driver's error fields (`sql` with the values inlined, `sqlMessage` that can quote a value,
 * `parameters`/`bindings`) and request bodies can hold names and birth dates.
 */
export const REDACTED_LOG_PATHS = [
  'req.headers.cookie',
  'req.headers.authorization',
  'res.headers["set-cookie"]',
  'req.body',
  'body',
  'err.sql',
  'err.sqlMessage',
  'err.parameters',
  'err.bindings',
  'err.values',
]

interface DriverError {
  code?: unknown
  errno?: unknown
  sqlState?: unknown
}

interface ErrorLike extends DriverError {
  name?: unknown
  type?: unknown
  stack?: unknown
}

/** An Error, or the plain object pino-http's serializer wrapper has already made of it. */
function isDatabaseError(error: unknown): error is ErrorLike {
  return (
    typeof error === 'object' &&
    error !== null &&
    (typeof (error as DriverError).sqlState === 'string' ||
      typeof (error as DriverError).errno === 'number')
  )
}

/**
 * A database error's message is Knex's SQL followed by the server's message, which can quote a
 * value ("Incorrect date value: '1961-…'"). The log keeps the error code and where it was
 * thrown; the message and the first stack line (which repeats it) are replaced by the code.
 */
export function serializeError(error: unknown): unknown {
  if (!isDatabaseError(error)) return stdSerializers.err(error as Error)
  const code = String(error.code ?? 'database error')
  const name = String(error.name ?? error.type ?? 'Error')
  const frames = String(error.stack ?? '')
    .split('\n')
    .filter((line) => line.trimStart().startsWith('at '))
  return {
    type: name,
    code,
    errno: error.errno,
    sqlState: error.sqlState,
    message: `database error ${code} (statement and values not logged)`,
    stack: [`${name}: database error ${code}`, ...frames].join('\n'),
  }
}

/** Application log (not the audit trail). Anything after `?` in a URL is left out by the app. */
export function createLogger(level: string, destination?: DestinationStream): Logger {
  const options = {
    level,
    serializers: { err: serializeError },
    redact: { paths: REDACTED_LOG_PATHS, censor: '[redacted]' },
  }
  return destination ? pino(options, destination) : pino(options)
}

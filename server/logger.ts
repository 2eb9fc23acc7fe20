import { pino, type Logger } from 'pino'

/**
 * Application log (not the audit trail). Cookies and anything after `?` in a URL are redacted:
 * search strings can hold patient names.
 */
export function createLogger(level: string): Logger {
  return pino({
    level,
    redact: {
      paths: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'],
      censor: '[redacted]',
    },
  })
}

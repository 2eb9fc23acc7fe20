import { ApiError } from '@/api/http'

/**
 * The server's field details as one message per field, without the "field: " prefix the API
 * adds so that a message read alone still names its field.
 */
export function fieldErrorsFrom(error: unknown): Record<string, string> {
  if (!(error instanceof ApiError) || !error.details) return {}
  return Object.fromEntries(
    Object.entries(error.details).map(([field, messages]) => [
      field,
      messages[0]?.replace(/^[^:]+: /, '') ?? '',
    ]),
  )
}

/** The form-level message: the server's own words, or a plain fallback. */
export function formErrorFrom(error: unknown): string {
  return error instanceof Error ? error.message : 'Saving failed.'
}

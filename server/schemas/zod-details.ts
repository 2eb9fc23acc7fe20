import type { ZodError } from 'zod'

/** Field path → messages, each message naming its field so a toast alone is still useful. */
export function zodDetails(error: ZodError): Record<string, string[]> {
  const details: Record<string, string[]> = {}
  for (const issue of error.issues) {
    const field = issue.path.length > 0 ? issue.path.join('.') : 'body'
    const message = `${field}: ${issue.message}`
    ;(details[field] ??= []).push(message)
  }
  return details
}

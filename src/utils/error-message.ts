/** The message of whatever was thrown, for a toast or an inline error. */
export function errorMessage(caught: unknown): string {
  return caught instanceof Error ? caught.message : String(caught)
}

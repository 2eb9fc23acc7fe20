/** The one error type services throw; the error handler turns it into the API error body. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: Record<string, string[]>,
  ) {
    super(message)
    this.name = 'HttpError'
  }
}

export const badRequest = (message: string, details?: Record<string, string[]>) =>
  new HttpError(400, 'validation_failed', message, details)

export const unauthorized = (message = 'Please sign in.') =>
  new HttpError(401, 'unauthorized', message)

export const forbidden = (message = 'Your role does not allow this.') =>
  new HttpError(403, 'forbidden', message)

export const notFound = (what: string) => new HttpError(404, 'not_found', `No such ${what}.`)

export const conflict = (message: string, details?: Record<string, string[]>) =>
  new HttpError(409, 'conflict', message, details)

/**
 * Inside a visibility check, "the parent is not visible" becomes "this is not found" (so nothing
 * leaks about records outside the actor's reach); any other failure, such as a lost database
 * connection, stays what it is.
 */
export function asNotFound(error: unknown, what: string): never {
  if (error instanceof HttpError && error.status === 404) throw notFound(what)
  throw error
}

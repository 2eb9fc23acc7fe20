import type { ApiErrorBody } from '@shared/types/api'

const BASE = import.meta.env.VITE_API_BASE ?? '/api'

/** Every failed API call throws this, with the server's code, message and field details. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: Record<string, string[]>,
  ) {
    super(message)
    this.name = 'ApiError'
  }
}

type Listener = (error: ApiError) => void
const unauthorizedListeners = new Set<Listener>()

/** Lets the session store react when any call finds the session gone. */
export function onUnauthorized(listener: Listener): () => void {
  unauthorizedListeners.add(listener)
  return () => unauthorizedListeners.delete(listener)
}

async function request<T>(method: string, path: string, body?: unknown): Promise<T> {
  let response: Response
  try {
    response = await fetch(`${BASE}${path}`, {
      method,
      credentials: 'same-origin',
      headers: body === undefined ? {} : { 'Content-Type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    })
  } catch {
    throw new ApiError(
      0,
      'offline',
      'The server cannot be reached. Check the connection and try again.',
    )
  }
  if (response.status === 204) return undefined as T
  const text = await response.text()
  const parsed: unknown = text ? JSON.parse(text) : undefined
  if (!response.ok) {
    const error = (parsed as ApiErrorBody | undefined)?.error
    const apiError = new ApiError(
      response.status,
      error?.code ?? 'http_error',
      error?.message ?? `The server answered ${response.status}.`,
      error?.details,
    )
    if (response.status === 401 && !path.startsWith('/auth/login')) {
      for (const listener of unauthorizedListeners) listener(apiError)
    }
    throw apiError
  }
  return parsed as T
}

/** Builds a query string from defined values only. */
export function queryString(params: Record<string, string | number | undefined>): string {
  const search = new URLSearchParams()
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined && value !== '') search.set(key, String(value))
  }
  const text = search.toString()
  return text ? `?${text}` : ''
}

export const http = {
  get: <T>(path: string) => request<T>('GET', path),
  post: <T>(path: string, body?: unknown) => request<T>('POST', path, body ?? {}),
  patch: <T>(path: string, body: unknown) => request<T>('PATCH', path, body),
  put: <T>(path: string, body: unknown) => request<T>('PUT', path, body),
  delete: <T>(path: string) => request<T>('DELETE', path),
}

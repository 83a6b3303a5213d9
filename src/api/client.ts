/**
 * The one typed API client. Every request goes through `apiRequest`, which turns the server's
 * `{ error: { code, message } }` answers into an `ApiError`.
 */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message)
    this.name = 'ApiError'
  }
}

export interface ApiRequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE'
  body?: unknown
  signal?: AbortSignal
}

export async function apiRequest<T>(path: string, options: ApiRequestOptions = {}): Promise<T> {
  const { method = 'GET', body, signal } = options
  const headers: Record<string, string> = { Accept: 'application/json' }
  if (body !== undefined && !(body instanceof FormData)) headers['Content-Type'] = 'application/json'
  let response: Response
  try {
    response = await fetch(`/api${path}`, {
      method,
      headers,
      body: body === undefined ? undefined : body instanceof FormData ? body : JSON.stringify(body),
      credentials: 'same-origin',
      signal,
    })
  } catch (error) {
    throw new ApiError(0, 'network', `The server could not be reached (${(error as Error).message}).`)
  }
  const text = await response.text()
  const payload: unknown = text ? safeJson(text) : null
  if (!response.ok) {
    const error = (payload as { error?: { code?: string; message?: string } } | null)?.error
    throw new ApiError(response.status, error?.code ?? 'http_error', error?.message ?? `The server answered ${response.status}.`)
  }
  return payload as T
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text)
  } catch {
    return null
  }
}

/** `GET /api/health` answer. */
export interface HealthStatus {
  status: 'ok' | 'degraded'
  db: 'ok' | 'down'
  version: string
}

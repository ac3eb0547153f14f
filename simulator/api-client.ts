// A small fetch client for the app's public JSON API, with waiting for a starting app.

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly retryAfterS?: number,
  ) {
    super(message)
  }
}

export interface ApiClient {
  readonly baseUrl: string
  request<T>(method: 'GET' | 'POST', path: string, options?: { token?: string; body?: unknown }): Promise<T>
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

export function createApiClient(baseUrl: string, timeoutMs = 10_000): ApiClient {
  return {
    baseUrl,
    async request<T>(method: 'GET' | 'POST', path: string, options: { token?: string; body?: unknown } = {}) {
      const headers: Record<string, string> = { accept: 'application/json' }
      if (options.token) headers.authorization = `Bearer ${options.token}`
      if (options.body !== undefined) headers['content-type'] = 'application/json'
      const response = await fetch(new URL(path, baseUrl), {
        method,
        headers,
        body: options.body === undefined ? undefined : JSON.stringify(options.body),
        signal: AbortSignal.timeout(timeoutMs),
      })
      const text = await response.text()
      const data = text ? (JSON.parse(text) as unknown) : undefined
      if (!response.ok) {
        const error = (data as { error?: { code?: string; message?: string; retryAfterSeconds?: number } })?.error
        const header = Number(response.headers.get('retry-after'))
        throw new ApiError(
          response.status,
          error?.code ?? 'http_error',
          `${method} ${path}: ${response.status} ${error?.message ?? response.statusText}`,
          error?.retryAfterSeconds ?? (Number.isFinite(header) && header > 0 ? header : undefined),
        )
      }
      return data as T
    },
  }
}

/** Retries `attempt` while the app is unreachable or says it is not ready (5xx, 429). */
export async function withRetry<T>(
  what: string,
  attempt: () => Promise<T>,
  options: { deadlineMs?: number; log?: (line: string) => void; signal?: AbortSignal } = {},
): Promise<T> {
  const deadline = Date.now() + (options.deadlineMs ?? 5 * 60_000)
  let delayMs = 1000
  for (;;) {
    try {
      return await attempt()
    } catch (err) {
      const retryable = !(err instanceof ApiError) || err.status >= 500 || err.status === 429
      if (!retryable || Date.now() > deadline || options.signal?.aborted) throw err
      const waitMs = err instanceof ApiError && err.retryAfterS ? err.retryAfterS * 1000 : delayMs
      options.log?.(`${what}: ${(err as Error).message}; retrying in ${Math.round(waitMs / 1000)} s`)
      await sleep(waitMs)
      delayMs = Math.min(delayMs * 2, 10_000)
    }
  }
}

/** Waits until GET /api/v1/health answers 200. */
export async function waitForApi(api: ApiClient, log?: (line: string) => void, deadlineMs?: number): Promise<void> {
  await withRetry('waiting for the app', () => api.request('GET', '/api/v1/health'), { log, deadlineMs })
}

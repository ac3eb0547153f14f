import type { ApiErrorBody } from '@shared/schemas/common'

export interface ApiErrorInit {
  status: number
  code: string
  message: string
  fields?: Record<string, string>
  retryAfterSeconds?: number
  details?: Record<string, unknown>
}

/** Every failed API call rejects with this, whatever went wrong underneath. */
export class ApiError extends Error {
  readonly status: number
  readonly code: string
  readonly fields: Record<string, string>
  readonly retryAfterSeconds: number | null
  /** What the server wants the caller to see before it asks again (e.g. warnings to confirm). */
  readonly details: Record<string, unknown>

  constructor(init: ApiErrorInit) {
    super(init.message)
    this.name = 'ApiError'
    this.status = init.status
    this.code = init.code
    this.fields = init.fields ?? {}
    this.retryAfterSeconds = init.retryAfterSeconds ?? null
    this.details = init.details ?? {}
  }
}

export function isApiErrorBody(data: unknown): data is ApiErrorBody {
  if (typeof data !== 'object' || data === null || !('error' in data)) return false
  const error = (data as { error: unknown }).error
  return typeof error === 'object' && error !== null && 'code' in error && 'message' in error
}

/** "2 minutes", "45 seconds" — rounded up so nobody retries too early. */
export function formatWait(seconds: number): string {
  if (seconds < 60) {
    const s = Math.max(1, Math.ceil(seconds))
    return `${s} second${s === 1 ? '' : 's'}`
  }
  const minutes = Math.ceil(seconds / 60)
  return `${minutes} minute${minutes === 1 ? '' : 's'}`
}

/** A sentence for an error banner. */
export function describeError(error: unknown): string {
  if (error instanceof ApiError) {
    if (error.code === 'rate_limited' && error.retryAfterSeconds != null) {
      return `Too many attempts. Try again in ${formatWait(error.retryAfterSeconds)}.`
    }
    return error.message
  }
  if (error instanceof Error) return error.message
  return 'Something went wrong.'
}

import type { ZodError } from 'zod'

/** An error with an HTTP status and a stable code; the error middleware turns it into the error shape. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    readonly retryAfterSeconds?: number,
    /** What the caller needs to decide, e.g. the warnings a confirmation must acknowledge. */
    readonly details?: Record<string, unknown>,
  ) {
    super(message)
  }
}

export const badRequest = (message: string, fields?: Record<string, string>) => new AppError(400, 'invalid_input', message, fields)
export const unauthenticated = (message = 'Sign in first') => new AppError(401, 'unauthenticated', message)
export const forbidden = (message = 'Your role does not allow this') => new AppError(403, 'forbidden', message)
export const notFound = (what = 'Not found') => new AppError(404, 'not_found', what)
export const conflict = (code: string, message: string, fields?: Record<string, string>) => new AppError(409, code, message, fields)
/** 409 asking the caller to send the request again with `confirm: true` once it has shown `details`. */
export const confirmNeeded = (message: string, details: Record<string, unknown>) =>
  new AppError(409, 'confirm_needed', message, { confirm: 'send again with confirm: true to go ahead' }, undefined, details)

export function fromZod(error: ZodError, where: 'body' | 'query' | 'params'): AppError {
  const fields: Record<string, string> = {}
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join('.') : where
    fields[key] ??= issue.message
  }
  const first = Object.entries(fields)[0]
  return badRequest(first ? `${first[0]}: ${first[1]}` : `Invalid ${where}`, fields)
}

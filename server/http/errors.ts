import type { ErrorRequestHandler, RequestHandler } from 'express'
import type { Logger } from '../logger'
import { AppError } from '../errors'

export const notFoundHandler: RequestHandler = (req, _res, next) =>
  next(new AppError(404, 'not_found', `No such endpoint: ${req.method} ${req.originalUrl.split('?')[0]}`))

/** Maps every error to the one error shape; anything unexpected is logged and answered 500 without detail. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error, req, res, _next) => {
    let appError: AppError
    if (error instanceof AppError) {
      appError = error
    } else if (error?.type === 'entity.too.large') {
      appError = new AppError(413, 'too_large', `The request body is larger than the limit (${error.limit} bytes)`)
    } else if (error?.type === 'entity.parse.failed') {
      appError = new AppError(400, 'invalid_json', 'The request body is not valid JSON')
    } else if (isDatabaseUnavailable(error)) {
      appError = new AppError(503, 'unavailable', 'The database is unavailable; try again shortly', undefined, 5)
    } else if (typeof error?.status === 'number' && error.status >= 400 && error.status < 500) {
      appError = new AppError(error.status, 'bad_request', error.message ?? 'Bad request')
    } else {
      logger.error({ err: error, method: req.method, path: req.path }, 'unhandled error')
      appError = new AppError(500, 'internal', 'Something went wrong on our side; it has been logged')
    }
    if (appError.retryAfterSeconds) res.setHeader('Retry-After', String(appError.retryAfterSeconds))
    res.status(appError.status).json({
      error: {
        code: appError.code,
        message: appError.message,
        ...(appError.fields ? { fields: appError.fields } : {}),
        ...(appError.retryAfterSeconds ? { retryAfterSeconds: appError.retryAfterSeconds } : {}),
      },
    })
  }
}

/** Connection failures and server shutdowns are outages to wait out (503), not bugs (500). */
export function isDatabaseUnavailable(error: unknown): boolean {
  if (!error || typeof error !== 'object') return false
  const e = error as { name?: string; message?: string; original?: { code?: string; message?: string }; parent?: { code?: string }; code?: string }
  if (e.name?.startsWith('SequelizeConnection') || e.name === 'SequelizeHostNotReachableError' || e.name === 'ConnectionAcquireTimeoutError') return true
  const code = e.original?.code ?? e.parent?.code ?? e.code ?? ''
  if (/^(08|57P0)/.test(code) || ['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT'].includes(code)) return true
  // A connection the server dropped mid-query (a restart) carries no SQLSTATE, only pg's own message.
  return /Connection terminated|connection is closed|Client has encountered a connection error|Connection ended unexpectedly|Client was closed and is not queryable|timeout exceeded when trying to connect/i.test(e.original?.message ?? e.message ?? '')
}

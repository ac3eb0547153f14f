import type { ErrorRequestHandler, RequestHandler } from 'express'
import type { Logger } from '../logger'
import { AppError } from '../errors'
import { redactUrl } from './redact'

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
      appError = new AppError(400, 'invalid_json', 'The request body is not valid JSON', { body: 'not valid JSON' })
    } else if (isUniqueViolation(error)) {
      appError = uniqueConflict(error)
    } else if (databaseCode(error) === '22003') {
      // An id or count past PostgreSQL's integer that no schema caught: the request's number, not our bug.
      appError = new AppError(400, 'out_of_range', 'A number in the request is larger than the server stores')
    } else if (isDatabaseUnavailable(error)) {
      appError = new AppError(503, 'unavailable', 'The database is unavailable; try again shortly', undefined, 5)
    } else if (typeof error?.status === 'number' && error.status >= 400 && error.status < 500) {
      appError = new AppError(error.status, 'bad_request', error.message ?? 'Bad request')
    } else {
      logger.error({ err: error, method: req.method, path: redactUrl(req.originalUrl ?? req.path) }, 'unhandled error')
      appError = new AppError(500, 'internal', 'Something went wrong on our side; it has been logged')
    }
    // Every 400 names what is wrong; the whole body when nothing narrower is known.
    if (appError.status === 400 && !appError.fields) appError = new AppError(400, appError.code, appError.message, { body: appError.message })
    if (appError.retryAfterSeconds) res.setHeader('Retry-After', String(appError.retryAfterSeconds))
    res.status(appError.status).json({
      error: {
        code: appError.code,
        message: appError.message,
        ...(appError.fields ? { fields: appError.fields } : {}),
        ...(appError.retryAfterSeconds ? { retryAfterSeconds: appError.retryAfterSeconds } : {}),
        ...(appError.details ? { details: appError.details } : {}),
      },
    })
  }
}

function databaseCode(error: unknown): string {
  const e = error as { original?: { code?: string }; parent?: { code?: string } } | null
  return e?.original?.code ?? e?.parent?.code ?? ''
}

/** Connection failures and server shutdowns are outages to wait out (503), not bugs (500). */
export function isDatabaseUnavailable(error: unknown): boolean {
  if (!error || typeof error !== 'object') return false
  const e = error as { name?: string; message?: string; original?: { code?: string; message?: string }; parent?: { code?: string }; code?: string }
  if (e.name?.startsWith('SequelizeConnection') || e.name === 'SequelizeHostNotReachableError' || e.name === 'ConnectionAcquireTimeoutError') return true
  const code = e.original?.code ?? e.parent?.code ?? e.code ?? ''
  if (/^(08|57P0)/.test(code) || ['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT'].includes(code)) return true
  // A connection the server dropped mid-query (a restart) carries no SQLSTATE, only pg's own message.
  return /Connection terminated|connection is closed|Client has encountered a connection error|Connection ended unexpectedly|Client was closed and is not queryable|timeout exceeded when trying to connect/i.test(
    e.original?.message ?? e.message ?? '',
  )
}

/** A unique index refused a row: two requests raced to make the same thing (the service's own check ran before either wrote). */
function isUniqueViolation(error: unknown): boolean {
  const e = error as { name?: string; original?: { code?: string }; parent?: { code?: string }; code?: string } | null
  return e?.name === 'SequelizeUniqueConstraintError' || (e?.original?.code ?? e?.parent?.code ?? e?.code) === '23505'
}

/** What each unique index means, in the words the services use for the same refusal. */
const UNIQUE_CONFLICTS: Record<string, { code: string; message: string }> = {
  water_changes_one_open: { code: 'water_change_in_progress', message: 'A water change is already in progress on this tank; finish it first' },
  watch_rules_one_override: { code: 'override_exists', message: 'This tank already has its own version of this rule; change that one' },
  users_email_unique: { code: 'email_taken', message: 'Someone already uses this e-mail address' },
  import_sources_organization_id_name_key: { code: 'source_exists', message: 'An import source of that name already exists' },
  test_kit_entries_client_id_unique: { code: 'client_id_reused', message: 'This entry was sent already; reload to see it' },
  care_log_client_id_unique: { code: 'client_id_reused', message: 'This entry was sent already; reload to see it' },
}

function uniqueConflict(error: unknown): AppError {
  const e = error as { original?: { constraint?: string }; parent?: { constraint?: string } }
  const constraint = e.original?.constraint ?? e.parent?.constraint ?? ''
  const known = UNIQUE_CONFLICTS[constraint]
  return known
    ? new AppError(409, known.code, known.message)
    : new AppError(409, 'conflict', 'Another request made the same change at the same moment; reload to see it')
}

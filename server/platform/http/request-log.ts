import type { IncomingMessage } from 'node:http'
import { pinoHttp } from 'pino-http'
import type { Logger } from '../logger'
import { redactUrl } from './redact'

const urlOf = (req: IncomingMessage) => redactUrl((req as IncomingMessage & { originalUrl?: string }).originalUrl ?? req.url ?? '')

/**
 * One line per request at debug level (failures at warn and error), with the URL's secrets redacted
 * and no headers: a wall key, a token or a cookie never reaches the log.
 */
export function requestLogger(logger: Logger) {
  return pinoHttp({
    logger,
    autoLogging: { ignore: (req) => req.url === '/api/v1/health' },
    customLogLevel: (_req, res, error) => (error || res.statusCode >= 500 ? 'error' : 'debug'),
    // pino-http builds the message before the level check: skip the redaction when debug is off,
    // or every device POST pays for a line nobody writes.
    customSuccessMessage: (req, res, ms) => (logger.isLevelEnabled('debug') ? `${req.method} ${urlOf(req)} ${res.statusCode} ${Math.round(ms)} ms` : ''),
    customErrorMessage: (req, res) => `${req.method} ${urlOf(req)} ${res.statusCode} failed`,
    serializers: {
      req: (req: { id?: unknown; method?: string; url?: string; remoteAddress?: string }) => ({
        id: req.id,
        method: req.method,
        url: redactUrl(req.url ?? ''),
        remoteAddress: req.remoteAddress,
      }),
      res: (res: { statusCode?: number }) => ({ statusCode: res.statusCode }),
    },
  })
}

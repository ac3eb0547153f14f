import type { Writable } from 'node:stream'
import { pino, type Logger } from 'pino'
import { PinoPretty } from 'pino-pretty'

export type { Logger }

/** `pretty`: short coloured lines for a person at a terminal; `json`: one JSON object per line for log collectors. */
export type LogFormat = 'json' | 'pretty'

/** Tokens, passwords and secrets never reach the log (URLs are redacted where they are logged: server/platform/http/redact.ts). */
export function createLogger(level: string, options: { format?: LogFormat; destination?: Writable } = {}): Logger {
  const settings = {
    level,
    redact: {
      paths: ['req.headers.authorization', 'req.headers.cookie', '*.password', '*.token', '*.newPassword', '*.currentPassword', '*.access_token'],
      censor: '[redacted]',
    },
  }
  if (options.format === 'pretty') {
    // In-process (not a worker transport), so the compiled server needs nothing beside its bundle.
    const pretty = PinoPretty({
      colorize: !options.destination && process.stdout.isTTY,
      translateTime: 'SYS:HH:MM:ss',
      ignore: 'pid,hostname,req,res,responseTime,reqId',
      singleLine: true,
      destination: options.destination ?? 1,
      sync: true,
    })
    return pino(settings, pretty)
  }
  return options.destination ? pino(settings, options.destination) : pino(settings)
}

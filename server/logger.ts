import { pino, type Logger } from 'pino'

export type { Logger }

/** Tokens, passwords and secrets never reach the log. */
export function createLogger(level: string): Logger {
  return pino({
    level,
    redact: {
      paths: [
        'req.headers.authorization',
        'req.headers.cookie',
        '*.password',
        '*.token',
        '*.newPassword',
        '*.currentPassword',
      ],
      censor: '[redacted]',
    },
  })
}

import { pino, type Logger } from 'pino'

/** Structured JSON logs; secrets are redacted wherever they might appear. */
export function createLogger(level: string): Logger {
  return pino({
    level,
    redact: {
      paths: ['password', '*.password', 'currentPassword', 'newPassword', 'token', '*.token', 'req.headers.cookie', 'req.headers["x-csrf-token"]'],
      censor: '[redacted]',
    },
  })
}
export type { Logger }

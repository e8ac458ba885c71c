import { pino, type Logger } from 'pino';

// JSON lines; secrets are redacted wherever they might ride along.
export function createLogger(level: string): Logger {
  return pino({
    level,
    base: { app: 'crumbtrail' },
    timestamp: pino.stdTimeFunctions.isoTime,
    redact: {
      paths: ['password', '*.password', '*.currentPassword', '*.newPassword', 'req.headers.cookie', 'req.headers["x-csrf-token"]', 'token', '*.token', 'connectionString'],
      censor: '[redacted]',
    },
  });
}
export type { Logger };

// JSON logs to stdout with UTC time; secrets are redacted by path.
import { pino, type Logger } from 'pino';

export function createLogger(level: string = 'info'): Logger {
  return pino({
    level,
    timestamp: pino.stdTimeFunctions.isoTime,
    redact: {
      paths: [
        'req.headers.cookie',
        'req.headers.authorization',
        'req.headers["x-xsrf-token"]',
        'res.headers["set-cookie"]',
        '*.password',
        '*.currentPassword',
        '*.newPassword',
        '*.token',
      ],
      censor: '[redacted]',
    },
  });
}

export type { Logger };

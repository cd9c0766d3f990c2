import { pino, type Logger } from 'pino';

/** The server's logger; cookies, CSRF tokens and passwords never reach the log. */
export function createLogger(level: string): Logger {
  return pino({
    level,
    redact: {
      paths: [
        'req.headers.cookie',
        'req.headers["x-xsrf-token"]',
        'res.headers["set-cookie"]',
        '*.password',
        '*.currentPassword',
        '*.newPassword',
      ],
      censor: '[hidden]',
    },
  });
}

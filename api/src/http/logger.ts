/** The process logger (pino, JSON lines on stdout) with secrets redacted. */
import pino, { type Logger } from 'pino';
import type { LogLevel } from '../config';

/** A pino logger at `level` that never prints cookies, tokens or authorization headers. */
export function createLogger(level: LogLevel): Logger {
  return pino({
    level,
    base: { app: 'quarterturn' },
    redact: {
      paths: ['req.headers.cookie', 'req.headers.authorization', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'],
      censor: '[redacted]',
    },
  });
}

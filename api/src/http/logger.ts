/** The process logger (pino, JSON lines on stdout) with secrets redacted. */
import pino, { type DestinationStream, type Logger } from 'pino';
import type { LogLevel } from '../config';

/** A pino logger at `level` that never prints cookies, tokens or authorization headers; on stdout unless `destination` is given (benchmarks). */
export function createLogger(level: LogLevel, destination?: DestinationStream): Logger {
  const options = {
    level,
    base: { app: 'quarterturn' },
    redact: {
      paths: ['req.headers.cookie', 'req.headers.authorization', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'],
      censor: '[redacted]',
    },
  };
  return destination ? pino(options, destination) : pino(options);
}

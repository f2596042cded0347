/**
 * Keeps a server or worker process alive through a PostgreSQL restart. pg-boss 10 completes and
 * fails jobs without awaiting the promise (manager.js, `onFetch`), so a connection lost at that
 * moment rejects with no handler, and Node's default for that is to end the process: the
 * worker would vanish mid-sweep. A lost connection is logged instead (the job's expiry brings
 * it back); any other unhandled rejection still ends the process, as by default.
 */
import type { Logger } from 'pino';
import { isConnectionError } from '../workers/with-db-retry';

/** Installs the handler once per process (entry points only: it changes process-wide behaviour). */
export function surviveLostConnections(logger: Logger): void {
  process.on('unhandledRejection', (reason) => {
    if (isConnectionError(reason)) {
      logger.warn({ err: (reason as Error)?.message }, 'database connection lost in a background step (will recover)');
      return;
    }
    // Same outcome as Node's default (--unhandled-rejections=throw): an uncaught exception.
    throw reason;
  });
}

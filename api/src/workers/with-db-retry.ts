/** Retries a database step through a lost connection (e.g. PostgreSQL restarting) instead of failing the job. */

const CONNECTION_ERROR = /ECONNREFUSED|ECONNRESET|terminat|Connection terminated|the database system is (starting up|shutting down)|connect ETIMEDOUT|57P01|57P03|SequelizeConnection|not queryable/i;

/** Whether `err` looks like a lost or refused connection rather than a bad statement. */
export function isConnectionError(err: unknown): boolean {
  const e = err as { name?: string; message?: string; code?: string; parent?: { code?: string; message?: string } };
  return CONNECTION_ERROR.test(`${e?.name ?? ''} ${e?.message ?? ''} ${e?.code ?? ''} ${e?.parent?.code ?? ''} ${e?.parent?.message ?? ''}`);
}

/** Runs `fn`, retrying connection errors with a growing delay for up to `budgetMs`; other errors pass through. */
export async function withDbRetry<T>(fn: () => Promise<T>, budgetMs = 60_000, isStopped: () => boolean = () => false): Promise<T> {
  const started = Date.now();
  let delay = 250;
  for (;;) {
    try {
      return await fn();
    } catch (err) {
      if (!isConnectionError(err) || Date.now() - started > budgetMs || isStopped()) throw err;
      await new Promise((r) => setTimeout(r, delay));
      delay = Math.min(3000, delay * 2);
    }
  }
}

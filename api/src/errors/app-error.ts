/** The one exception type services throw; the error middleware turns it into the JSON error shape. */
import type { ErrorCode } from '@shared/errors';

/** An error with a stable code and HTTP status, safe to show to the client. */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    readonly status: number,
    message: string,
    readonly details?: unknown,
    /** When the client may retry (503, 429): sent as the Retry-After header, seconds. */
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

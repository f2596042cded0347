/**
 * Stable error codes of the one JSON error shape
 * `{ "error": { "code", "message", "details"? } }` used by every 4xx/5xx response.
 * Codes never change once released; messages are for humans and may.
 */
export const ERROR_CODES = [
  'VALIDATION_FAILED',
  'NOT_FOUND',
  'UNAUTHENTICATED',
  'FORBIDDEN',
  'CSRF_REJECTED',
  'RATE_LIMITED',
  'PAYLOAD_TOO_LARGE',
  'CONFLICT',
  'LAST_ADMIN',
  'INSTANCE_SET_NOT_FOUND',
  'MAP_NOT_FOUND',
  'SCENARIO_NOT_FOUND',
  'INVALID_INSTANCE_FILES',
  /** 429: the user has UPLOADS_PER_USER uploads in progress already. */
  'TOO_MANY_UPLOADS',
  /** 413: storing the files would take the set owner past a storage quota (details: QuotaExceededDetails). */
  'QUOTA_EXCEEDED',
  /** 400: a field trial log (or a file of the upload) is not a valid trial log; details: { errors } with file, line, column. */
  'INVALID_TRIAL_LOG',
  /** 422: a field trial log departs from its result's plan; details: { errors: [the first divergent row] }. */
  'TRIAL_DIVERGES',
  /** 404: no submission batch of that id that the viewer owns. */
  'BATCH_NOT_FOUND',
  /** 429: the person has BATCH_LIMITS.maxRunningPerUser batches still running. */
  'TOO_MANY_BATCHES',
  'SWEEP_NOT_FOUND',
  'SWEEP_TOO_LARGE',
  /** The server's interactive worker pool (api/src/workers/interactive-pool.ts): 503, try again later. */
  'COMPUTE_TIME_LIMIT',
  'COMPUTE_BUSY',
  'COMPUTE_MEMORY_LIMIT',
  /** PostgreSQL is not answering (stopped, restarting, unreachable): 503 with Retry-After; the session is kept. */
  'DATABASE_UNAVAILABLE',
  'INTERNAL',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number] | (string & {});

/** The body of every error response. */
export interface ErrorBody {
  readonly error: {
    readonly code: ErrorCode;
    readonly message: string;
    readonly details?: unknown;
  };
}

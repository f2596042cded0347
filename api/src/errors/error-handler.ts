/**
 * The last middleware: maps every error to `{ error: { code, message, details? } }`.
 * Only AppError messages and validation issues reach the client; anything unexpected is
 * logged with its stack and answered with a generic 500.
 */
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { ErrorBody, ErrorCode } from '@shared/errors';
import { isConnectionError } from '../workers/with-db-retry';
import { AppError } from './app-error';

interface Mapped {
  readonly status: number;
  readonly code: ErrorCode;
  readonly message: string;
  readonly details?: unknown;
  readonly retryAfterSeconds?: number;
}

/** Shape of errors raised by body-parser (express.json) and by multer, matched by duck typing. */
interface HttpishError {
  readonly type?: string;
  readonly status?: number;
  readonly expose?: boolean;
  readonly name?: string;
  readonly code?: string;
  readonly field?: string;
}

/** Seconds a client is asked to wait before retrying while the database is unavailable. */
export const DATABASE_RETRY_AFTER_SECONDS = 5;

/** Translates a known error into status, code and message; undefined for unexpected errors. */
export function mapError(err: unknown): Mapped | undefined {
  if (err instanceof AppError) return { status: err.status, code: err.code, message: err.message, details: err.details, retryAfterSeconds: err.retryAfterSeconds };
  if (err instanceof ZodError) {
    return {
      status: 400,
      code: 'VALIDATION_FAILED',
      message: 'The request is not valid: ' + err.issues.map((i) => `${i.path.join('.') || '(root)'}: ${i.message}`).join('; '),
      details: err.issues.map((i) => ({ path: i.path, code: i.code, message: i.message })),
    };
  }
  if (!err || typeof err !== 'object') return undefined;
  // A refused or lost PostgreSQL connection, wherever it surfaced (a query, the session store, loading
  // the account): the request may work in a moment, so 503 with Retry-After instead of a 500.
  if (isConnectionError(err)) {
    return {
      status: 503, code: 'DATABASE_UNAVAILABLE', retryAfterSeconds: DATABASE_RETRY_AFTER_SECONDS,
      message: 'The database is not answering right now. You are still signed in; try again in a few seconds.',
    };
  }
  const e = err as HttpishError;
  // Sequelize is matched by name so this module does not load it.
  if (e.name === 'SequelizeUniqueConstraintError') {
    return { status: 409, code: 'CONFLICT', message: 'This conflicts with an existing record.' };
  }
  if (e.type === 'entity.too.large') {
    return { status: 413, code: 'PAYLOAD_TOO_LARGE', message: 'The request body is larger than the server accepts.' };
  }
  if (e.type === 'entity.parse.failed') {
    return { status: 400, code: 'VALIDATION_FAILED', message: 'The request body is not valid JSON.' };
  }
  if (e.name === 'MulterError') {
    return e.code === 'LIMIT_FILE_SIZE'
      ? { status: 413, code: 'PAYLOAD_TOO_LARGE', message: `The uploaded file${e.field ? ` in field "${e.field}"` : ''} is larger than the server accepts.` }
      : { status: 400, code: 'VALIDATION_FAILED', message: `The upload is not valid (${e.code ?? 'unknown'}${e.field ? `, field "${e.field}"` : ''}).` };
  }
  // Other body-parser errors (bad charset, unsupported encoding) carry a safe 4xx status.
  if (e.expose === true && typeof e.status === 'number' && e.status >= 400 && e.status < 500) {
    return { status: e.status, code: 'VALIDATION_FAILED', message: err instanceof Error ? err.message : 'The request is not valid.' };
  }
  return undefined;
}

/** Builds the JSON body of an error response. */
export function errorBody(code: ErrorCode, message: string, details?: unknown): ErrorBody {
  return { error: details === undefined ? { code, message } : { code, message, details } };
}

/** The error middleware; register it last. */
export function errorHandler(): ErrorRequestHandler {
  return (err, req, res, next) => {
    if (res.headersSent) {
      next(err);
      return;
    }
    const mapped = mapError(err);
    if (mapped) {
      if (mapped.status >= 500) req.log?.error({ err }, 'request failed');
      if (mapped.retryAfterSeconds !== undefined) res.set('Retry-After', String(Math.max(1, Math.ceil(mapped.retryAfterSeconds))));
      res.status(mapped.status).json(errorBody(mapped.code, mapped.message, mapped.details));
      return;
    }
    req.log?.error({ err }, 'unexpected error');
    res.status(500).json(errorBody('INTERNAL', 'Something went wrong on the server. The problem has been logged.', { requestId: req.id }));
  };
}

/** Answers any request that reached it with 404 NOT_FOUND in the error shape. */
export function notFound(): RequestHandler {
  return (req, res) => {
    res.status(404).json(errorBody('NOT_FOUND', `No route for ${req.method} ${req.originalUrl.split('?')[0]}`));
  };
}

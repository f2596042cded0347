/** Turns a failed HTTP call into one sentence for a person. */
import { HttpErrorResponse } from '@angular/common/http';
import type { ErrorBody } from '@shared/errors';

function isErrorBody(body: unknown): body is ErrorBody {
  const error = (body as { error?: unknown } | null)?.error;
  return typeof error === 'object' && error !== null && typeof (error as { message?: unknown }).message === 'string';
}

/**
 * The server's own message when the body has the shared error shape
 * `{ error: { code, message, details? } }`, otherwise a generic sentence by status.
 */
export function errorMessage(err: unknown): string {
  if (!(err instanceof HttpErrorResponse)) return 'Something went wrong in the app.';
  if (isErrorBody(err.error)) return err.error.error.message;
  if (err.status === 0) return 'The server could not be reached. Check your connection and try again.';
  if (err.status >= 500) return `The server failed (HTTP ${err.status}). Try again later.`;
  return `The request failed (HTTP ${err.status}).`;
}

/** The stable error code when the body has the shared error shape, else null. */
export function errorCode(err: unknown): string | null {
  return err instanceof HttpErrorResponse && isErrorBody(err.error) ? err.error.error.code : null;
}

/**
 * Reads a refused request's answer `{ error: { code, message, details? } }` into the form field it
 * names (validation and 409 CONFLICT details carry `path`), so a form can show the message under
 * that field instead of a snack bar far from it.
 */
import { HttpErrorResponse } from '@angular/common/http';
import { errorMessage } from '../core/error-message';

/** The field a refusal names (one of `fields`), or null, and the sentence to show. */
export interface FieldRefusal {
  readonly field: string | null;
  readonly message: string;
}

/** The first detail whose path starts with one of `fields`; otherwise the whole message. */
export function fieldRefusalOf(err: unknown, fields: readonly string[]): FieldRefusal {
  const details = err instanceof HttpErrorResponse ? (err.error as { error?: { details?: unknown } } | null)?.error?.details : undefined;
  if (Array.isArray(details)) {
    for (const d of details as { path?: unknown; message?: unknown }[]) {
      const field = Array.isArray(d?.path) ? d.path[0] : undefined;
      if (typeof field === 'string' && fields.includes(field) && typeof d.message === 'string') return { field, message: d.message };
    }
  }
  return { field: null, message: errorMessage(err) };
}

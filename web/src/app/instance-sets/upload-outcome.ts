/** What an upload's HTTP events and errors mean for the page: progress, stored counts, or problems by file. */
import { HttpErrorResponse, HttpEventType, type HttpEvent } from '@angular/common/http';
import { INVALID_INSTANCE_FILES, type UploadProblem, type UploadResponse } from '@shared/instance-sets';
import { errorCode, errorMessage } from '../core/error-message';

/** The state of the upload panel. */
export type UploadState =
  | { readonly kind: 'idle' }
  | { readonly kind: 'sending'; readonly fileCount: number; readonly percent: number | null }
  | { readonly kind: 'stored'; readonly result: UploadResponse }
  | { readonly kind: 'refused'; readonly message: string; readonly problems: readonly UploadProblem[] };

/** The state after one upload event; undefined for events that change nothing. */
export function stateAfterEvent(event: HttpEvent<UploadResponse>, fileCount: number): UploadState | undefined {
  if (event.type === HttpEventType.UploadProgress) {
    return { kind: 'sending', fileCount, percent: event.total ? Math.round((100 * event.loaded) / event.total) : null };
  }
  if (event.type === HttpEventType.Response && event.body) return { kind: 'stored', result: event.body };
  return undefined;
}

/** The state after a failed upload: the problem list for INVALID_INSTANCE_FILES, else the message alone. */
export function stateAfterError(err: unknown): UploadState {
  const problems = errorCode(err) === INVALID_INSTANCE_FILES && err instanceof HttpErrorResponse
    ? ((err.error as { error: { details?: UploadProblem[] } }).error.details ?? [])
    : [];
  return { kind: 'refused', message: errorMessage(err), problems };
}

/** `file:line:column` of a problem, or just the file for whole-file problems. */
export function problemPlace(p: UploadProblem): string {
  return p.line > 0 ? `line ${p.line}, column ${p.column}` : 'whole file';
}

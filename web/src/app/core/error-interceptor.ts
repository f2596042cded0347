/**
 * Shows every failed API call in a snack bar, then lets the caller see the error too. A 503
 * DATABASE_UNAVAILABLE answer goes to DatabaseStatus instead (the banner says it once, rather
 * than a snack bar per call), and any other API answer tells DatabaseStatus the database is back.
 */
import { HttpContextToken, HttpEventType, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { catchError, tap, throwError } from 'rxjs';
import { DatabaseStatus, IS_DATABASE_PROBE } from './database-status';
import { errorCode, errorMessage } from './error-message';

/** Set to true on a request whose caller reports failures itself (no snack bar). */
export const IS_QUIET = new HttpContextToken<boolean>(() => false);

/** How long an error stays on screen; long enough to read two lines. */
const SHOW_MS = 8000;

/** Functional interceptor: opens a snack bar with the server's message for any failed request. */
export const errorInterceptor: HttpInterceptorFn = (req, next) => {
  const snackBar = inject(MatSnackBar);
  const database = inject(DatabaseStatus);
  // The health probe answers 200 while the database is down; DatabaseStatus reads it itself.
  const isProbe = req.context.get(IS_DATABASE_PROBE);
  return next(req).pipe(
    tap((event) => {
      if (!isProbe && event.type === HttpEventType.Response && database.isUnavailable()) database.clear();
    }),
    catchError((err: unknown) => {
      if (!isProbe && errorCode(err) === 'DATABASE_UNAVAILABLE') {
        database.report(err);
        return throwError(() => err);
      }
      if (!req.context.get(IS_QUIET)) {
        snackBar.open(errorMessage(err), 'Dismiss', { duration: SHOW_MS, politeness: 'assertive' });
      }
      return throwError(() => err);
    }),
  );
};

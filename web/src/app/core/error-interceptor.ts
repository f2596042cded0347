/** Shows every failed API call in a snack bar, then lets the caller see the error too. */
import { HttpContextToken, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { catchError, throwError } from 'rxjs';
import { errorMessage } from './error-message';

/** Set to true on a request whose caller reports failures itself (no snack bar). */
export const IS_QUIET = new HttpContextToken<boolean>(() => false);

/** How long an error stays on screen; long enough to read two lines. */
const SHOW_MS = 8000;

/** Functional interceptor: opens a snack bar with the server's message for any failed request. */
export const errorInterceptor: HttpInterceptorFn = (req, next) => {
  const snackBar = inject(MatSnackBar);
  return next(req).pipe(
    catchError((err: unknown) => {
      if (!req.context.get(IS_QUIET)) {
        snackBar.open(errorMessage(err), 'Dismiss', { duration: SHOW_MS, politeness: 'assertive' });
      }
      return throwError(() => err);
    }),
  );
};

/** Application-wide providers: zoneless change detection, router, HTTP with CSRF and error reporting. */
import { ApplicationConfig, provideBrowserGlobalErrorListeners, provideZonelessChangeDetection } from '@angular/core';
import { provideHttpClient, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { CSRF_COOKIE, CSRF_HEADER } from '@shared/auth-contract';
import { routes } from './app-routes';
import { errorInterceptor } from './core/error-interceptor';

/** The providers `bootstrapApplication` starts the app with (tests reuse pieces of it). */
export const appConfig: ApplicationConfig = {
  providers: [
    provideBrowserGlobalErrorListeners(),
    provideZonelessChangeDetection(),
    provideRouter(routes, withComponentInputBinding()),
    // Angular's XSRF interceptor copies the double-submit cookie into the header on every
    // same-origin POST/PUT/PATCH/DELETE, which is exactly the contract in shared/auth.ts.
    provideHttpClient(
      withInterceptors([errorInterceptor]),
      withXsrfConfiguration({ cookieName: CSRF_COOKIE, headerName: CSRF_HEADER }),
    ),
  ],
};

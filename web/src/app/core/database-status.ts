/**
 * Whether the API's database is answering, as the app last heard. The error interceptor reports
 * a 503 DATABASE_UNAVAILABLE answer here; from then on GET /api/health (which answers even while
 * the database is down) is asked every Retry-After seconds until it says the database is up.
 * Anyone who must not act on a failed answer (the session) waits with `whenAvailable()`.
 */
import { HttpClient, HttpContext, HttpErrorResponse, HttpContextToken } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import type { HealthResponse } from '@shared/auth';

/** Set on the health probe so the error interceptor leaves it to this service. */
export const IS_DATABASE_PROBE = new HttpContextToken<boolean>(() => false);

const DEFAULT_WAIT_S = 5;
const MIN_WAIT_S = 2;
const MAX_WAIT_S = 30;

/** The app-wide database state behind the banner. */
@Injectable({ providedIn: 'root' })
export class DatabaseStatus {
  private readonly http = inject(HttpClient);
  private readonly state = signal(false);
  private timer: ReturnType<typeof setTimeout> | undefined;
  private waitS = DEFAULT_WAIT_S;
  private waiters: (() => void)[] = [];

  /** Whether the last word from the API was that its database is unavailable. */
  readonly isUnavailable = this.state.asReadonly();

  /** Records a DATABASE_UNAVAILABLE answer and starts checking for the database's return. */
  report(err?: unknown): void {
    const retryAfter = err instanceof HttpErrorResponse ? Number(err.headers?.get('Retry-After')) : NaN;
    this.waitS = Number.isFinite(retryAfter) && retryAfter > 0 ? Math.min(MAX_WAIT_S, Math.max(MIN_WAIT_S, retryAfter)) : DEFAULT_WAIT_S;
    this.state.set(true);
    this.timer ??= setTimeout(() => this.checkNow(), this.waitS * 1000);
  }

  /** Records that the API answered with its database: hides the banner and wakes the waiters. */
  clear(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = undefined;
    if (!this.state()) return;
    this.state.set(false);
    const waiters = this.waiters;
    this.waiters = [];
    waiters.forEach((wake) => wake());
  }

  /** Asks GET /api/health now instead of at the next scheduled check. */
  checkNow(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = undefined;
    const context = new HttpContext().set(IS_DATABASE_PROBE, true);
    this.http.get<HealthResponse>('/api/health', { context }).subscribe({
      next: (health) => (health.db === 'up' ? this.clear() : this.scheduleCheck()),
      // The server itself is not answering either: keep trying at the same pace.
      error: () => this.scheduleCheck(),
    });
  }

  /** Resolves at once while the database answers, otherwise once it does again. */
  whenAvailable(): Promise<void> {
    if (!this.state()) return Promise.resolve();
    return new Promise((resolve) => this.waiters.push(resolve));
  }

  private scheduleCheck(): void {
    if (this.state()) this.timer ??= setTimeout(() => this.checkNow(), this.waitS * 1000);
  }
}

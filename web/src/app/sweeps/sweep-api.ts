/** HTTP and SSE calls of the sweeps area: /api/sweeps and the dev mailbox. */
import { HttpClient, HttpContext } from '@angular/common/http';
import { IS_QUIET } from '../core/error-interceptor';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type { MailboxResponse, SweepDetail, SweepEvent, SweepListResponse, SweepPreviewResponse, SweepProgress, SweepResultRow, SweepResultsResponse } from '@shared/runs';
import { SWEEP_EVENT_NAMES } from '@shared/runs';
import type { SweepDefinitionInput } from '@shared/sweeps';

/**
 * What the page's sweep stream emits: the server's events, and `lost` when the page is out of touch
 * with live figures (the stream dropped, or the server lost its database); the next `progress`
 * snapshot means it is in touch again.
 */
export type SweepStreamEvent = SweepEvent | { readonly type: 'lost' };

/** Delay before reopening a stream the browser gave up on, ms (doubling up to the maximum). */
const REOPEN_MS = 2000;
const REOPEN_MAX_MS = 30_000;

/** Download links of a sweep (plain links, so the browser saves the files): one CSV row per run, and every stored plan in one zip. */
export function sweepDownloadUrls(id: number): { readonly csv: string; readonly plans: string } {
  return { csv: `/api/sweeps/${id}/results.csv`, plans: `/api/sweeps/${id}/plans.zip` };
}

/** Owns the sweeps URLs. */
@Injectable({ providedIn: 'root' })
export class SweepApi {
  private readonly http = inject(HttpClient);

  /** GET /api/sweeps. */
  list(): Observable<SweepListResponse> {
    return this.http.get<SweepListResponse>('/api/sweeps');
  }

  /** GET /api/sweeps/:id. */
  get(id: number): Observable<SweepDetail> {
    return this.http.get<SweepDetail>(`/api/sweeps/${id}`);
  }

  /** GET /api/sweeps/:id/results. */
  results(id: number): Observable<SweepResultsResponse> {
    return this.http.get<SweepResultsResponse>(`/api/sweeps/${id}/results`);
  }

  /** POST /api/sweeps/preview. */
  preview(def: SweepDefinitionInput): Observable<SweepPreviewResponse> {
    return this.http.post<SweepPreviewResponse>('/api/sweeps/preview', def);
  }

  /** POST /api/sweeps. */
  launch(def: SweepDefinitionInput): Observable<SweepDetail> {
    return this.http.post<SweepDetail>('/api/sweeps', def);
  }

  /** POST /api/sweeps/:id/cancel. */
  cancel(id: number): Observable<SweepDetail> {
    return this.http.post<SweepDetail>(`/api/sweeps/${id}/cancel`, {});
  }

  /** GET /api/dev/mailbox (admins only; 404 unless the local fake SMTP server runs in development mode). */
  mailbox(): Observable<MailboxResponse> {
    return this.http.get<MailboxResponse>('/api/dev/mailbox', { context: new HttpContext().set(IS_QUIET, true) });
  }

  /**
   * The live events of a sweep as a cold stream over EventSource: subscribing opens it,
   * unsubscribing closes it; the browser reconnects by itself after a dropped connection
   * (the server then sends a fresh progress snapshot). A reconnection answered with an error
   * (503 while the database is down) makes the browser give up, so the stream is then reopened
   * here with a growing delay. Every drop, and the server's `unavailable` event, emit `lost`.
   */
  events(id: number): Observable<SweepStreamEvent> {
    return new Observable<SweepStreamEvent>((subscriber) => {
      let source: EventSource | undefined;
      let reopen: ReturnType<typeof setTimeout> | undefined;
      let delay = REOPEN_MS;
      const open = () => {
        const s = new EventSource(`/api/sweeps/${id}/events`, { withCredentials: true });
        source = s;
        s.addEventListener(SWEEP_EVENT_NAMES.progress, (e: MessageEvent<string>) => {
          delay = REOPEN_MS;
          subscriber.next({ type: 'progress', progress: JSON.parse(e.data) as SweepProgress });
        });
        s.addEventListener(SWEEP_EVENT_NAMES.result, (e: MessageEvent<string>) => subscriber.next({ type: 'result', row: JSON.parse(e.data) as SweepResultRow }));
        s.addEventListener(SWEEP_EVENT_NAMES.unavailable, () => subscriber.next({ type: 'lost' }));
        s.addEventListener('error', () => {
          subscriber.next({ type: 'lost' });
          if (s.readyState !== EventSource.CLOSED) return;
          s.close();
          reopen = setTimeout(open, delay);
          delay = Math.min(REOPEN_MAX_MS, delay * 2);
        });
      };
      open();
      return () => {
        if (reopen) clearTimeout(reopen);
        source?.close();
      };
    });
  }
}

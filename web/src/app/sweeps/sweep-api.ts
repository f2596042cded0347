/** HTTP and SSE calls of the sweeps area: /api/sweeps and the dev mailbox. */
import { HttpClient, HttpContext } from '@angular/common/http';
import { IS_QUIET } from '../core/error-interceptor';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type { MailboxResponse, SweepDetail, SweepEvent, SweepListResponse, SweepPreviewResponse, SweepProgress, SweepResultRow, SweepResultsResponse } from '@shared/runs';
import { SWEEP_EVENT_NAMES } from '@shared/runs';
import type { SweepDefinitionInput } from '@shared/sweeps';

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
   * (the server then sends a fresh progress snapshot).
   */
  events(id: number): Observable<SweepEvent> {
    return new Observable<SweepEvent>((subscriber) => {
      const source = new EventSource(`/api/sweeps/${id}/events`, { withCredentials: true });
      const onProgress = (e: MessageEvent<string>) => subscriber.next({ type: 'progress', progress: JSON.parse(e.data) as SweepProgress });
      const onResult = (e: MessageEvent<string>) => subscriber.next({ type: 'result', row: JSON.parse(e.data) as SweepResultRow });
      source.addEventListener(SWEEP_EVENT_NAMES.progress, onProgress);
      source.addEventListener(SWEEP_EVENT_NAMES.result, onResult);
      return () => source.close();
    });
  }
}

/** HTTP calls of plan submissions. */
import { HttpClient, HttpContext, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { SubmissionRequest } from '@shared/plan-format';
import type { SubmissionListResponse, SubmissionProfilesResponse, SubmissionView } from '@shared/submissions';
import { BATCH_UPLOAD_FIELD, type SubmissionBatchListResponse, type SubmissionBatchSummary, type SubmissionBatchView } from '@shared/submission-batches';
import { IS_QUIET } from '../core/error-interceptor';

/** Owns /api/submissions. */
@Injectable({ providedIn: 'root' })
export class SubmissionApi {
  private readonly http = inject(HttpClient);

  /** POST /api/submissions (quiet: the page shows a rejection's violation itself). */
  submit(body: SubmissionRequest): Observable<SubmissionView> {
    return this.http.post<SubmissionView>('/api/submissions', body, { context: new HttpContext().set(IS_QUIET, true) });
  }

  /** GET /api/submissions: the researcher's accepted plans. */
  list(): Observable<SubmissionListResponse> {
    return this.http.get<SubmissionListResponse>('/api/submissions');
  }

  /** GET /api/submissions/profiles: the robot profiles to offer for an instance, the default first. */
  profiles(scenarioId: number, agents: number): Observable<SubmissionProfilesResponse> {
    return this.http.get<SubmissionProfilesResponse>('/api/submissions/profiles', { params: new HttpParams().set('scenarioId', scenarioId).set('agents', agents) });
  }

  /** POST /api/submissions/batches with one zip (quiet: the page shows a refusal's file, line and field itself). */
  sendBatchZip(file: File): Observable<SubmissionBatchSummary> {
    const body = new FormData();
    body.append(BATCH_UPLOAD_FIELD, file, file.name);
    return this.http.post<SubmissionBatchSummary>('/api/submissions/batches', body, { context: new HttpContext().set(IS_QUIET, true) });
  }

  /** POST /api/submissions/batches with a JSON manifest whose plans carry their text (quiet, as above). */
  sendBatchJson(manifest: unknown): Observable<SubmissionBatchSummary> {
    return this.http.post<SubmissionBatchSummary>('/api/submissions/batches', manifest, { context: new HttpContext().set(IS_QUIET, true) });
  }

  /** GET /api/submissions/batches: the researcher's batches, newest first. */
  batches(): Observable<SubmissionBatchListResponse> {
    return this.http.get<SubmissionBatchListResponse>('/api/submissions/batches');
  }

  /** GET /api/submissions/batches/:id: progress and each plan's outcome. */
  batch(id: number): Observable<SubmissionBatchView> {
    return this.http.get<SubmissionBatchView>(`/api/submissions/batches/${id}`);
  }
}

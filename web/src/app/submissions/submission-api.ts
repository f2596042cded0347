/** HTTP calls of plan submissions. */
import { HttpClient, HttpContext, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { SubmissionRequest } from '@shared/plan-format';
import type { SubmissionListResponse, SubmissionProfilesResponse, SubmissionView } from '@shared/submissions';
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
}

/** HTTP calls of the external solvers (issue 16, item 4): /api/external-solvers. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ExternalSolverListResponse, ExternalSolverRequestInput, ExternalSolverView } from '@shared/external-solvers';

/** Owns the external solver URLs. */
@Injectable({ providedIn: 'root' })
export class ExternalSolverApi {
  private readonly http = inject(HttpClient);

  /** GET /api/external-solvers. */
  list(): Observable<ExternalSolverListResponse> {
    return this.http.get<ExternalSolverListResponse>('/api/external-solvers');
  }

  /** POST /api/external-solvers (maintainers). */
  register(body: ExternalSolverRequestInput): Observable<ExternalSolverView> {
    return this.http.post<ExternalSolverView>('/api/external-solvers', body);
  }

  /** DELETE /api/external-solvers/:id (maintainers; 409 while live sweeps wait for it). */
  remove(id: number): Observable<void> {
    return this.http.delete<void>(`/api/external-solvers/${id}`);
  }
}

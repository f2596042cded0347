/** HTTP call for the start page's live counts. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { StatsResponse } from '@shared/auth';

/** Owns GET /api/stats. */
@Injectable({ providedIn: 'root' })
export class StatsApi {
  private readonly http = inject(HttpClient);

  /** GET /api/stats: counts of what the hub holds (public data only for visitors). */
  stats(): Observable<StatsResponse> {
    return this.http.get<StatsResponse>('/api/stats');
  }
}

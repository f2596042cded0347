/** HTTP call of a board row's history (GET /api/history, issue 16, item 5). */
import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { InstanceHistory } from '@shared/history';

/** A board row's key and the window of its history. */
export interface HistoryRequest {
  readonly scenarioId: string;
  readonly agents: string;
  readonly model: string;
  readonly variant: string;
  readonly profile: string;
  readonly start: number;
  readonly limit: number;
}

/** Owns /api/history. */
@Injectable({ providedIn: 'root' })
export class HistoryApi {
  private readonly http = inject(HttpClient);

  /** GET /api/history: items [start, start + limit) of the row's stored results, newest first. */
  history(r: HistoryRequest): Observable<InstanceHistory> {
    const params = new HttpParams({ fromObject: { scenarioId: r.scenarioId, agents: r.agents, model: r.model, variant: r.variant, profile: r.profile, start: r.start, limit: r.limit } });
    return this.http.get<InstanceHistory>('/api/history', { params });
  }
}

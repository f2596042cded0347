/** HTTP calls of the leaderboards: pages of a view, the per-model summary, chart data and export links. */
import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ExportFormat } from '@shared/exports-table';
import type { BestAmong, LeaderboardCharts, LeaderboardPage, LeaderboardSummary } from '@shared/leaderboards';

/** Drill-down and profile scope of the summary and the charts. */
export interface BoardScope {
  readonly mapId: number | null;
  readonly profile: string | null;
}

function scopeParams(scope: BoardScope): Record<string, string> {
  return {
    ...(scope.mapId !== null ? { mapId: String(scope.mapId) } : {}),
    ...(scope.profile !== null ? { profile: scope.profile } : {}),
  };
}

/** Owns /api/leaderboards and /api/exports. */
@Injectable({ providedIn: 'root' })
export class LeaderboardApi {
  private readonly http = inject(HttpClient);

  /** GET /api/leaderboards/rows: rows [start, end) of the view given as its URL parameters (counted only when asked). */
  rows(view: Record<string, string>, start: number, end: number, isCounted: boolean): Observable<LeaderboardPage> {
    const params = new HttpParams({ fromObject: { ...view, start, end, ...(isCounted ? {} : { count: '0' }) } });
    return this.http.get<LeaderboardPage>('/api/leaderboards/rows', { params });
  }

  /** GET /api/leaderboards/summary; `bestAmong` = executable leaves out plans that collide at nominal times. */
  summary(scope: BoardScope, bestAmong: BestAmong = 'executable'): Observable<LeaderboardSummary> {
    return this.http.get<LeaderboardSummary>('/api/leaderboards/summary', { params: new HttpParams({ fromObject: { ...scopeParams(scope), bestAmong } }) });
  }

  /** GET /api/leaderboards/charts for one execution policy. */
  charts(scope: BoardScope, policy: string): Observable<LeaderboardCharts> {
    return this.http.get<LeaderboardCharts>('/api/leaderboards/charts', { params: new HttpParams({ fromObject: { ...scopeParams(scope), policy } }) });
  }

  /** The URL of GET /api/exports for the view (a plain link, so the browser downloads the file). */
  exportUrl(format: ExportFormat, view: Record<string, string>): string {
    return `/api/exports?${new HttpParams({ fromObject: { format, ...view } }).toString()}`;
  }
}

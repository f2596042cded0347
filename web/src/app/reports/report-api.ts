/** HTTP calls of the model comparison report: the sets and profiles to pick from, the report, and its export links. */
import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ModelComparisonReport, ReportChoices, ReportFormat } from '@shared/reports';

/** What one report is for. */
export interface ReportScope {
  readonly set: number;
  readonly profile: string;
  readonly policy: string;
}

const paramsOf = (scope: ReportScope, format?: ReportFormat): HttpParams =>
  new HttpParams({ fromObject: { set: String(scope.set), profile: scope.profile, policy: scope.policy, ...(format ? { format } : {}) } });

/** Owns /api/reports. */
@Injectable({ providedIn: 'root' })
export class ReportApi {
  private readonly http = inject(HttpClient);

  /** GET /api/reports/choices. */
  choices(): Observable<ReportChoices> {
    return this.http.get<ReportChoices>('/api/reports/choices');
  }

  /** GET /api/reports/model-comparison as JSON. */
  modelComparison(scope: ReportScope): Observable<ModelComparisonReport> {
    return this.http.get<ModelComparisonReport>('/api/reports/model-comparison', { params: paramsOf(scope) });
  }

  /** The download URL of the report in `format` (a plain link, so the browser saves the file). */
  exportUrl(scope: ReportScope, format: Exclude<ReportFormat, 'json'>): string {
    return `/api/reports/model-comparison?${paramsOf(scope, format).toString()}`;
  }
}

/**
 * HTTP calls of the plan viewer: POST /api/executions, GET /api/executions/:id, a result's stored
 * replays, and a stored result's plan (to replay in the browser, and its download addresses).
 */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ExecutionView, InstanceExecutionInput, ResultExecutionInput } from '@shared/executions';
import type { PlanDownloadFormat, ResultPlanView } from '@shared/result-plan-view';
import type { StoredResultExecutionsView } from '@shared/stored-executions';

/** Owns /api/executions. */
@Injectable({ providedIn: 'root' })
export class ExecutionApi {
  private readonly http = inject(HttpClient);

  /** POST /api/executions: simulate a stored result's plan, or (without a plan, after solving) an instance; answers the stored execution. */
  create(body: InstanceExecutionInput | ResultExecutionInput): Observable<ExecutionView> {
    return this.http.post<ExecutionView>('/api/executions', body);
  }

  /** GET /api/executions/:id. */
  get(id: number): Observable<ExecutionView> {
    return this.http.get<ExecutionView>(`/api/executions/${id}`);
  }

  /** GET /api/executions/stored/:resultId: the replays the sweep stored with a result, with their exact settings. */
  stored(resultId: number): Observable<StoredResultExecutionsView> {
    return this.http.get<StoredResultExecutionsView>(`/api/executions/stored/${resultId}`);
  }

  /** GET /api/executions/results/:resultId: a stored result's plan (anyone who may see the result; nothing runs on the server). */
  resultPlan(resultId: number): Observable<ResultPlanView> {
    return this.http.get<ResultPlanView>(`/api/executions/results/${resultId}`);
  }

  /** The download address of a stored result's plan: the JSON plan document or the text format. */
  planDownloadUrl(resultId: number, format: PlanDownloadFormat): string {
    return `/api/executions/results/${resultId}/plan.${format}`;
  }
}

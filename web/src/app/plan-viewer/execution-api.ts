/** HTTP calls of the plan viewer: POST /api/executions, GET /api/executions/:id and a result's stored replays. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ExecutionView, InstanceExecutionInput, ResultExecutionInput } from '@shared/executions';
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
}

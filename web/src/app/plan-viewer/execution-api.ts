/** HTTP calls of the plan viewer: POST /api/executions and GET /api/executions/:id. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ExecutionView, InstanceExecutionInput, ResultExecutionInput } from '@shared/executions';

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
}

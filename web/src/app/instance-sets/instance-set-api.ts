/** HTTP calls of the instance library: sets, uploads with progress, maps, scenarios, the generator. */
import { HttpClient, HttpContext, HttpParams, type HttpEvent } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import {
  UPLOAD_FIELD, type CreateInstanceSetRequest, type DeletionPreview, type GenerateInstancesRequest, type InstanceSetDetail,
  type InstanceSetListResponse, type MapDetail, type ScenarioDetail, type UpdateInstanceSetRequest, type UploadResponse,
} from '@shared/instance-sets';
import { IS_QUIET } from '../core/error-interceptor';

/** What the instance set table asks for. */
export interface InstanceSetQuery {
  readonly q: string;
  /** 1-based. */
  readonly page: number;
  readonly pageSize: number;
}

/** Owns /api/instance-sets, /api/maps and /api/scenarios. */
@Injectable({ providedIn: 'root' })
export class InstanceSetApi {
  private readonly http = inject(HttpClient);

  /** GET /api/instance-sets: one page of the sets the viewer may see. */
  list(query: InstanceSetQuery): Observable<InstanceSetListResponse> {
    let params = new HttpParams().set('page', query.page).set('pageSize', query.pageSize);
    if (query.q.trim() !== '') params = params.set('q', query.q.trim());
    return this.http.get<InstanceSetListResponse>('/api/instance-sets', { params });
  }

  /** GET /api/instance-sets/:id. */
  get(id: number): Observable<InstanceSetDetail> {
    return this.http.get<InstanceSetDetail>(`/api/instance-sets/${id}`);
  }

  /** POST /api/instance-sets. */
  create(body: CreateInstanceSetRequest): Observable<InstanceSetDetail> {
    return this.http.post<InstanceSetDetail>('/api/instance-sets', body);
  }

  /** PATCH /api/instance-sets/:id (quiet: the edit dialog shows a refusal beside the field it names). */
  update(id: number, body: UpdateInstanceSetRequest): Observable<InstanceSetDetail> {
    return this.http.patch<InstanceSetDetail>(`/api/instance-sets/${id}`, body, { context: new HttpContext().set(IS_QUIET, true) });
  }

  /** GET /api/instance-sets|maps|scenarios/:id/deletion-preview: what deleting it takes with it. */
  deletionPreview(kind: 'instance-sets' | 'maps' | 'scenarios', id: number): Observable<DeletionPreview> {
    return this.http.get<DeletionPreview>(`/api/${kind}/${id}/deletion-preview`);
  }

  /** DELETE /api/maps/:id or /api/scenarios/:id. */
  removeFile(kind: 'maps' | 'scenarios', id: number): Observable<void> {
    return this.http.delete<void>(`/api/${kind}/${id}`);
  }

  /** DELETE /api/instance-sets/:id. */
  remove(id: number): Observable<void> {
    return this.http.delete<void>(`/api/instance-sets/${id}`);
  }

  /**
   * POST /api/instance-sets/:id/files as multipart, reporting upload progress events. Quiet:
   * the page lists a refused upload's problems itself instead of a snack bar.
   */
  upload(id: number, files: readonly File[]): Observable<HttpEvent<UploadResponse>> {
    const form = new FormData();
    for (const f of files) form.append(UPLOAD_FIELD, f, f.name);
    return this.http.post<UploadResponse>(`/api/instance-sets/${id}/files`, form, {
      reportProgress: true,
      observe: 'events',
      context: new HttpContext().set(IS_QUIET, true),
    });
  }

  /** POST /api/instance-sets/generate (quiet, like upload). */
  generate(body: GenerateInstancesRequest): Observable<UploadResponse> {
    return this.http.post<UploadResponse>('/api/instance-sets/generate', body, { context: new HttpContext().set(IS_QUIET, true) });
  }

  /** GET /api/maps/:id: a map with its cells. */
  map(id: number): Observable<MapDetail> {
    return this.http.get<MapDetail>(`/api/maps/${id}`);
  }

  /** GET /api/scenarios/:id: a scenario with its rows. */
  scenario(id: number): Observable<ScenarioDetail> {
    return this.http.get<ScenarioDetail>(`/api/scenarios/${id}`);
  }

  /** The download URL of a stored map or scenario file (a plain link, so the browser saves it). */
  downloadUrl(kind: 'maps' | 'scenarios', id: number): string {
    return `/api/${kind}/${id}/download`;
  }

  /** The URL of the set's zip of every map and scenario as uploaded, with README.txt and SHA256SUMS (a plain link, so the browser downloads it). */
  archiveUrl(id: number): string {
    return `/api/instance-sets/${id}/archive`;
  }
}

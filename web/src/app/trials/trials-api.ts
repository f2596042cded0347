/** HTTP calls of the field-trials panel: a result's trials (GET) and attaching logs to it (POST multipart). */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ExecutionPolicyName } from '@shared/executions-constants';
import { TRIAL_UPLOAD_FIELD, type FieldTrialsView, type NamedRobotProfile, type TrialCalibrationView } from '@shared/field-trials';

/** Owns /api/trials. */
@Injectable({ providedIn: 'root' })
export class TrialsApi {
  private readonly http = inject(HttpClient);

  /** GET /api/trials/results/:resultId. */
  list(resultId: number): Observable<FieldTrialsView> {
    return this.http.get<FieldTrialsView>(`/api/trials/results/${resultId}`);
  }

  /** POST /api/trials/results/:resultId: the logs (or zips), the policy used and the notes; answers the stored upload. */
  attach(resultId: number, files: readonly File[], policy: ExecutionPolicyName, notes: string): Observable<FieldTrialsView> {
    const form = new FormData();
    form.append('policy', policy);
    if (notes.trim() !== '') form.append('notes', notes);
    for (const f of files) form.append(TRIAL_UPLOAD_FIELD, f, f.name);
    return this.http.post<FieldTrialsView>(`/api/trials/results/${resultId}`, form);
  }

  /** POST /api/trials/results/:resultId/calibration: fit a profile to the result's runs (all of them without runIds). */
  calibrate(resultId: number, runIds?: readonly number[]): Observable<TrialCalibrationView> {
    return this.http.post<TrialCalibrationView>(`/api/trials/results/${resultId}/calibration`, runIds ? { runIds } : {});
  }

  /** POST /api/robot-profiles: save the fit of `runIds` under `name`. */
  saveProfile(name: string, resultId: number, runIds: readonly number[]): Observable<NamedRobotProfile> {
    return this.http.post<NamedRobotProfile>('/api/robot-profiles', { name, resultId, runIds });
  }

  /** GET /api/robot-profiles: the named profiles the signed-in person may use. */
  profiles(): Observable<NamedRobotProfile[]> {
    return this.http.get<NamedRobotProfile[]>('/api/robot-profiles');
  }

  /** DELETE /api/trials/uploads/:id. */
  remove(uploadId: number): Observable<void> {
    return this.http.delete<void>(`/api/trials/uploads/${uploadId}`);
  }
}

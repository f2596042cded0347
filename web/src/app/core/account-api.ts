/** HTTP calls about the signed-in account: who am I, my settings, sign out. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { AccountSettingsRequest, MeResponse } from '@shared/auth';
import { SIGN_OUT_PATH } from '@shared/auth-contract';

/** Owns the /api/me and /api/auth URLs the shell uses. */
@Injectable({ providedIn: 'root' })
export class AccountApi {
  private readonly http = inject(HttpClient);

  /** GET /api/me: the current account, or a visitor. */
  me(): Observable<MeResponse> {
    return this.http.get<MeResponse>('/api/me');
  }

  /** PATCH /api/me/settings: changes the account's own settings; answers the updated session. */
  changeSettings(settings: AccountSettingsRequest): Observable<MeResponse> {
    return this.http.patch<MeResponse>('/api/me/settings', settings);
  }

  /** POST /api/auth/logout: ends the server session. */
  signOut(): Observable<unknown> {
    return this.http.post<unknown>(SIGN_OUT_PATH, {});
  }
}

/** HTTP calls of the API tokens page: list, create and revoke the signed-in person's tokens. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ApiTokenListResponse, CreatedApiToken, TokenScope } from '@shared/api-tokens-contract';

/** What the create form sends (shared/api-tokens.ts CreateApiTokenRequest). */
export interface NewApiToken {
  readonly name: string;
  readonly scopes: readonly TokenScope[];
  readonly expiresInDays: number;
}

/** Owns the /api/me/tokens URLs. */
@Injectable({ providedIn: 'root' })
export class ApiTokenApi {
  private readonly http = inject(HttpClient);

  /** GET /api/me/tokens: the tokens that are not revoked, newest first. */
  list(): Observable<ApiTokenListResponse> {
    return this.http.get<ApiTokenListResponse>('/api/me/tokens');
  }

  /** POST /api/me/tokens: a new token with its secret, which is never shown again. */
  create(token: NewApiToken): Observable<CreatedApiToken> {
    return this.http.post<CreatedApiToken>('/api/me/tokens', token);
  }

  /** DELETE /api/me/tokens/:id: revokes a token at once. */
  revoke(id: number): Observable<unknown> {
    return this.http.delete(`/api/me/tokens/${id}`);
  }
}

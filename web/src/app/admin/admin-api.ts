/** HTTP calls of the admin area. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { Account, ChangeRoleRequest, UserListResponse } from '@shared/auth';
import type { ChangeQuotaRequest, StorageQuotaView } from '@shared/storage-quota';

/** Owns /api/admin/users (accounts, roles and storage quotas). */
@Injectable({ providedIn: 'root' })
export class AdminApi {
  private readonly http = inject(HttpClient);

  /** GET /api/admin/users: every account. */
  users(): Observable<UserListResponse> {
    return this.http.get<UserListResponse>('/api/admin/users');
  }

  /** PATCH /api/admin/users/:id: gives an account another role; answers the updated account. */
  changeRole(id: number, role: ChangeRoleRequest['role']): Observable<Account> {
    const body: ChangeRoleRequest = { role };
    return this.http.patch<Account>(`/api/admin/users/${id}`, body);
  }

  /** GET /api/admin/users/:id/quota: one person's storage limits and use. */
  quota(id: number): Observable<StorageQuotaView> {
    return this.http.get<StorageQuotaView>(`/api/admin/users/${id}/quota`);
  }

  /** PATCH /api/admin/users/:id/quota: new limits per kind (null = the server default); answers the new view. */
  changeQuota(id: number, body: ChangeQuotaRequest): Observable<StorageQuotaView> {
    return this.http.patch<StorageQuotaView>(`/api/admin/users/${id}/quota`, body);
  }
}

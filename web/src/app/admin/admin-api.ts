/** HTTP calls of the admin area. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ChangeRoleRequest, UserListResponse } from '@shared/auth';

/** Owns /api/admin/users. */
@Injectable({ providedIn: 'root' })
export class AdminApi {
  private readonly http = inject(HttpClient);

  /** GET /api/admin/users: every account. */
  users(): Observable<UserListResponse> {
    return this.http.get<UserListResponse>('/api/admin/users');
  }

  /** PATCH /api/admin/users/:id: gives an account another role. */
  changeRole(id: number, role: ChangeRoleRequest['role']): Observable<unknown> {
    const body: ChangeRoleRequest = { role };
    return this.http.patch<unknown>(`/api/admin/users/${id}`, body);
  }
}

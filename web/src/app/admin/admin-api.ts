/** HTTP calls of the admin area. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { Account, ChangeRoleRequest, UserListResponse } from '@shared/auth';

/** Owns /api/admin/users. */
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
}

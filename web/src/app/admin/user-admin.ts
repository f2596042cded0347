/** Admin page: every account with a role picker per row, and one person's storage quota at a time. */
import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { DatePipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule, type MatSelectChange } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { firstValueFrom } from 'rxjs';
import type { Account, ChangeRoleRequest } from '@shared/auth';
import { Session } from '../core/session';
import { AdminApi } from './admin-api';
import { StorageQuotaEditor } from './storage-quota-editor';

type AssignableRole = ChangeRoleRequest['role'];

/** Roles an admin can hand out, least privileged first, with what each may do. */
const ROLE_CHOICES: readonly { readonly role: AssignableRole; readonly hint: string }[] = [
  { role: 'researcher', hint: 'uploads instance sets, submits plans' },
  { role: 'maintainer', hint: 'also launches sweeps, curates shared sets and leaderboards' },
  { role: 'admin', hint: 'also manages accounts' },
];

/** The page at /admin. */
@Component({
  selector: 'app-user-admin',
  templateUrl: './user-admin.html',
  styleUrl: './user-admin.scss',
  imports: [MatTableModule, MatSelectModule, MatButtonModule, MatProgressBarModule, DatePipe, StorageQuotaEditor],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class UserAdmin {
  private readonly api = inject(AdminApi);
  private readonly destroyRef = inject(DestroyRef);
  protected readonly session = inject(Session);
  protected readonly roleChoices = ROLE_CHOICES;
  protected readonly columns = ['displayName', 'login', 'email', 'createdAt', 'role', 'storage'];
  /** undefined while loading. */
  protected readonly users = signal<readonly Account[] | undefined>(undefined);
  /** Whether the list could not be loaded. */
  protected readonly hasFailed = signal(false);
  /** Id of the account whose role is being saved, so its picker is locked meanwhile. */
  protected readonly savingId = signal<number | null>(null);

  /** The account whose storage quota is open below the table. */
  protected readonly quotaOf = signal<Account | null>(null);

  /** Keeps each row (and its open picker) in place when one account changes. */
  protected readonly byId = (_: number, user: Account): number => user.id;

  constructor() {
    this.api.users().pipe(takeUntilDestroyed(this.destroyRef)).subscribe({
      next: (res) => this.users.set(res.users),
      error: () => this.hasFailed.set(true),
    });
  }

  /** Opens the storage quota of `user` below the table, or closes it when it is open already. */
  protected toggleQuota(user: Account): void {
    this.quotaOf.update((open) => (open?.id === user.id ? null : user));
  }

  /**
   * Saves a new role for one account. On refusal (e.g. LAST_ADMIN) the error interceptor shows
   * the server's reason and the picker goes back to the role the server still holds.
   */
  protected async changeRole(user: Account, change: MatSelectChange<AssignableRole>): Promise<void> {
    this.savingId.set(user.id);
    try {
      const updated = await firstValueFrom(this.api.changeRole(user.id, change.value));
      this.users.update((list) => list?.map((u) => (u.id === updated.id ? updated : u)));
      // Changing one's own role changes what the shell may show.
      if (user.id === this.session.account()?.id) await this.session.reload();
    } catch {
      change.source.value = user.role;
    } finally {
      this.savingId.set(null);
    }
  }
}

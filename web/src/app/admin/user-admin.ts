/**
 * Admin page: every account with a role picker and a Save button per row, and one person's storage
 * quota at a time. A picked role is only pending until Save and the confirmation; the result is
 * announced politely through a snack bar (a live region).
 */
import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { DatePipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { firstValueFrom } from 'rxjs';
import type { Account, ChangeRoleRequest } from '@shared/auth';
import { askToConfirm, type ConfirmQuestion } from '../core/confirm-dialog';
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

/** Rank of a role for telling a promotion from a demotion. */
const rankOf = (role: Account['role']): number => ROLE_CHOICES.findIndex((c) => c.role === role);
const hintOf = (role: Account['role']): string => ROLE_CHOICES.find((c) => c.role === role)?.hint ?? '';
const withArticle = (role: string): string => `${role === 'admin' ? 'an' : 'a'} ${role}`;

/** What the confirmation says before `user` gets role `next`. */
export function roleQuestion(user: Account, next: AssignableRole, isSelf: boolean): ConfirmQuestion {
  const name = `${user.displayName} (${user.login})`;
  const isDemotion = rankOf(next) < rankOf(user.role);
  const lost = ROLE_CHOICES.slice(rankOf(next) + 1, rankOf(user.role) + 1).map((c) => c.hint.replace(/^also /, ''));
  return {
    title: `Make ${name} ${withArticle(next)}?`,
    consequences: [
      `From ${user.role} to ${next}: ${withArticle(next)} ${hintOf(next)}.`,
      ...(isDemotion ? [`Rights they lose (what ${withArticle(user.role)} may and ${withArticle(next)} may not): ${lost.join('; ')}.`] : []),
      ...(isDemotion && next === 'researcher' ? ['Sweeps over other people\'s private sets go out of their sight; their sweeps over public sets and their own sets stay.'] : []),
      isSelf ? 'This is your own account: what you may see and do changes at once.' : 'It takes effect at their next request; nobody is signed out.',
    ],
    act: `Make ${next}`, keep: `Keep ${user.role}`, isDestructive: isDemotion,
  };
}

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
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly session = inject(Session);
  protected readonly roleChoices = ROLE_CHOICES;
  protected readonly columns = ['displayName', 'login', 'email', 'createdAt', 'role', 'storage'];
  /** undefined while loading. */
  protected readonly users = signal<readonly Account[] | undefined>(undefined);
  /** Whether the list could not be loaded. */
  protected readonly hasFailed = signal(false);
  /** Id of the account whose role is being saved, so its picker is locked meanwhile. */
  protected readonly savingId = signal<number | null>(null);

  /** Roles picked but not saved yet, by account id. */
  private readonly pending = signal<ReadonlyMap<number, AssignableRole>>(new Map());

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

  /** The role the picker of `user` shows: the pending choice, else the saved role. */
  protected pendingOf(user: Account): Account['role'] {
    return this.pending().get(user.id) ?? user.role;
  }

  /** Keeps a picked role as pending; nothing is sent until Save. */
  protected choose(user: Account, role: AssignableRole): void {
    this.pending.update((map) => {
      const next = new Map(map);
      if (role === user.role) next.delete(user.id);
      else next.set(user.id, role);
      return next;
    });
  }

  private forget(user: Account): void {
    this.pending.update((map) => {
      const next = new Map(map);
      next.delete(user.id);
      return next;
    });
  }

  /**
   * Saves the pending role of one account after a confirmation. On refusal (e.g. LAST_ADMIN) the
   * error interceptor shows the server's reason and the picker goes back to the role the server
   * still holds; on success a polite snack bar says what was saved.
   */
  protected async saveRole(user: Account): Promise<void> {
    const next = this.pending().get(user.id);
    if (next === undefined || next === user.role) return;
    // Asked first: a role is a set of rights and takes effect at that person's next request.
    const isConfirmed = await firstValueFrom(askToConfirm(this.dialog, roleQuestion(user, next, user.id === this.session.account()?.id)));
    if (!isConfirmed) {
      this.forget(user);
      return;
    }
    this.savingId.set(user.id);
    try {
      const updated = await firstValueFrom(this.api.changeRole(user.id, next));
      this.users.update((list) => list?.map((u) => (u.id === updated.id ? updated : u)));
      this.forget(user);
      this.snackBar.open(`Saved: ${updated.displayName} (${updated.login}) is now ${withArticle(updated.role)}.`, 'OK', { duration: 6000, politeness: 'polite' });
      // Changing one's own role changes what the shell may show.
      if (user.id === this.session.account()?.id) await this.session.reload();
    } catch {
      this.forget(user);
    } finally {
      this.savingId.set(null);
    }
  }
}

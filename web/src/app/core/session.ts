/** The signed-in account as signals, loaded once from GET /api/me. */
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { Account, MeResponse, Role } from '@shared/auth';
import { hasRole } from '@shared/auth-contract';
import { AccountApi } from './account-api';
import { DatabaseStatus } from './database-status';
import { errorCode } from './error-message';

const VISITOR: MeResponse = { account: null, role: 'visitor' };

/** Session store: who is signed in, with which role, and the account actions of the shell. */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly api = inject(AccountApi);
  private readonly database = inject(DatabaseStatus);
  /** null until the first GET /api/me has answered. */
  private readonly state = signal<MeResponse | null>(null);
  private pending: Promise<MeResponse> | null = null;

  /** The account, or null for a visitor (and before loading). */
  readonly account = computed<Account | null>(() => this.state()?.account ?? null);
  /** The role; `visitor` until loaded and when not signed in. */
  readonly role = computed<Role>(() => this.state()?.role ?? 'visitor');
  /** Whether GET /api/me has answered (successfully or not). */
  readonly isLoaded = computed(() => this.state() !== null);
  /** Whether someone is signed in. */
  readonly isSignedIn = computed(() => this.account() !== null);
  /** Whether the current role may use the admin area. */
  readonly isAdmin = computed(() => hasRole(this.role(), 'admin'));

  /**
   * Loads the session once; later calls share the first answer. A failed load counts as visitor,
   * except while the database is unavailable: the server kept the session, so the load waits for
   * the database and asks again rather than show a signed-in person as signed out.
   */
  load(): Promise<MeResponse> {
    this.pending ??= this.ask();
    return this.pending;
  }

  /** Forgets the cached answer and asks the server again. */
  reload(): Promise<MeResponse> {
    this.pending = null;
    return this.load();
  }

  /** Whether the current role is at least `needed`. */
  hasRole(needed: Role): boolean {
    return hasRole(this.role(), needed);
  }

  /**
   * Turns sweep-finished e-mails on or off. The switch moves at once and moves back if the
   * server refuses, so the menu never shows a setting the server does not hold.
   */
  async changeEmailSetting(isEmailOn: boolean): Promise<void> {
    const before = this.state();
    if (!before?.account) return;
    this.state.set({ ...before, account: { ...before.account, isEmailOn } });
    try {
      this.settle(await firstValueFrom(this.api.changeSettings({ isEmailOn })));
    } catch (err) {
      this.state.set(before);
      throw err;
    }
  }

  /** Ends the server session and becomes a visitor. */
  async signOut(): Promise<void> {
    await firstValueFrom(this.api.signOut());
    this.settle(VISITOR);
    this.pending = Promise.resolve(VISITOR);
  }

  private async ask(): Promise<MeResponse> {
    for (;;) {
      try {
        return this.settle(await firstValueFrom(this.api.me()));
      } catch (err) {
        if (errorCode(err) !== 'DATABASE_UNAVAILABLE') {
          // The error interceptor has already told the user; a visitor shell still works.
          return this.settle(VISITOR);
        }
        this.database.report(err);
        await this.database.whenAvailable();
      }
    }
  }

  private settle(me: MeResponse): MeResponse {
    this.state.set(me);
    return me;
  }
}

/** The account corner of the bar: name, role, e-mail setting and sign-out. */
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDividerModule } from '@angular/material/divider';
import { MatMenuModule } from '@angular/material/menu';
import { MatSlideToggleModule, type MatSlideToggleChange } from '@angular/material/slide-toggle';
import { Router, RouterLink } from '@angular/router';
import type { Account, Role } from '@shared/auth';
import { hasRole } from '@shared/auth-contract';
import { Session } from './session';

/** Menu button showing who is signed in, with the account's settings and sign-out. */
@Component({
  selector: 'app-account-menu',
  templateUrl: './account-menu.html',
  styleUrl: './account-menu.scss',
  imports: [MatButtonModule, MatMenuModule, MatSlideToggleModule, MatDividerModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountMenu {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  /** The signed-in account. */
  readonly account = input.required<Account>();
  /** The account's role. */
  readonly role = input.required<Role>();
  /** Who launches sweeps, so a researcher knows why there is no New sweep button and whom to ask. */
  protected readonly sweepNote = computed(() =>
    hasRole(this.role(), 'maintainer')
      ? 'Your role launches sweeps on the shared workers.'
      : 'Maintainers launch sweeps; an admin gives the maintainer role.',
  );

  /** Sends the new e-mail setting; the error interceptor reports a refusal. */
  protected async changeEmailSetting(change: MatSlideToggleChange): Promise<void> {
    try {
      await this.session.changeEmailSetting(change.checked);
    } catch {
      // The session has already put the old value back; move the switch with it.
      change.source.checked = !change.checked;
    }
  }

  /** Ends the session and returns to the start page. */
  protected async signOut(): Promise<void> {
    try {
      await this.session.signOut();
    } catch {
      return; // reported by the error interceptor; the account stays signed in
    }
    await this.router.navigateByUrl('/');
  }
}

/**
 * The API tokens page (/account/tokens, from the account menu): the person's tokens with name,
 * scopes, dates and last use; a form that creates one and shows its secret once, with a copy
 * button; revoking after a confirmation (issue 16, item 1).
 */
import { Clipboard } from '@angular/cdk/clipboard';
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, viewChild } from '@angular/core';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { hasRole } from '@shared/auth-contract';
import type { ApiTokenView, CreatedApiToken, TokenScope } from '@shared/api-tokens-contract';
import { askToConfirm } from '../core/confirm-dialog';
import { Session } from '../core/session';
import { ApiTokenApi } from './api-token-api';
import { atLeastOneScope, SCOPE_CHOICES, TOKEN_LIFETIMES } from './api-token-rules';

/** The page at /account/tokens. */
@Component({
  selector: 'app-api-tokens-page',
  templateUrl: './api-tokens-page.html',
  styleUrl: './api-tokens-page.scss',
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatTableModule, DatePipe, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ApiTokensPage {
  private readonly api = inject(ApiTokenApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly clipboard = inject(Clipboard);
  private readonly session = inject(Session);
  private readonly fb = inject(NonNullableFormBuilder);
  /** The form element's directive: resetting through it also forgets the submit, so no field shows an error. */
  private readonly formDirective = viewChild.required(FormGroupDirective);

  protected readonly lifetimes = TOKEN_LIFETIMES;
  protected readonly columns = ['name', 'scopes', 'createdAt', 'expiresAt', 'lastUsedAt', 'actions'];
  /** Whether the account may hold the sweep scope now. */
  protected readonly maySweep = computed(() => hasRole(this.session.role(), 'maintainer'));
  protected readonly scopeChoices = SCOPE_CHOICES;

  /** undefined while loading. */
  protected readonly tokens = signal<readonly ApiTokenView[] | undefined>(undefined);
  protected readonly hasFailed = signal(false);
  /** The token just created, whose secret shows until the person closes it. */
  protected readonly created = signal<CreatedApiToken | null>(null);
  protected readonly isCreating = signal(false);
  protected readonly isCopied = signal(false);

  protected readonly form = this.fb.group({
    name: ['', [Validators.required, Validators.maxLength(100)]],
    scopes: this.fb.group({ read: true, submit: false, sweep: false }, { validators: atLeastOneScope }),
    expiresInDays: [90],
  });

  constructor() {
    this.load();
    // A reactive form disables a control itself; a [disabled] binding would not.
    effect(() => {
      const sweep = this.form.controls.scopes.controls.sweep;
      if (this.maySweep()) sweep.enable();
      else sweep.disable();
    });
  }

  private load(): void {
    this.api.list().subscribe({ next: (res) => this.tokens.set(res.tokens), error: () => this.hasFailed.set(true) });
  }

  /** Whether `token` is past its expiry. */
  protected isExpired(token: ApiTokenView): boolean {
    return Date.parse(token.expiresAt) <= Date.now();
  }

  /** Sends the form; on success shows the secret once and lists the token. */
  protected async createToken(): Promise<void> {
    if (this.form.invalid || this.isCreating()) {
      this.form.markAllAsTouched();
      return;
    }
    const { name, scopes, expiresInDays } = this.form.getRawValue();
    const picked = (Object.keys(scopes) as TokenScope[]).filter((s) => scopes[s] && (s !== 'sweep' || this.maySweep()));
    this.isCreating.set(true);
    try {
      const made = await firstValueFrom(this.api.create({ name: name.trim(), scopes: picked, expiresInDays }));
      this.created.set(made);
      this.isCopied.set(false);
      this.tokens.update((list) => [made.token, ...(list ?? [])]);
      this.formDirective().resetForm();
    } catch {
      // The error interceptor shows the server's reason.
    } finally {
      this.isCreating.set(false);
    }
  }

  /** Copies the new secret to the clipboard. */
  protected copySecret(): void {
    const secret = this.created()?.secret;
    if (secret !== undefined) this.isCopied.set(this.clipboard.copy(secret));
  }

  /** Hides the secret for good. */
  protected closeSecret(): void {
    this.created.set(null);
  }

  /** Revokes `token` after a confirmation; scripts using it get 401 from then on. */
  protected async revoke(token: ApiTokenView): Promise<void> {
    const isConfirmed = await firstValueFrom(askToConfirm(this.dialog, {
      title: `Revoke the token “${token.name}”?`,
      consequences: ['Every script that uses it is refused from its next request on. This cannot be undone; create a new token if you need one again.'],
      act: 'Revoke token', keep: 'Keep token', isDestructive: true,
    }));
    if (!isConfirmed) return;
    try {
      await firstValueFrom(this.api.revoke(token.id));
      this.tokens.update((list) => list?.filter((t) => t.id !== token.id));
      if (this.created()?.token.id === token.id) this.created.set(null);
      this.snackBar.open(`Revoked the token “${token.name}”.`, 'OK', { duration: 6000, politeness: 'polite' });
    } catch {
      // Reported by the error interceptor; the list stays as it was.
    }
  }
}

/**
 * The page at /sweeps/mailbox: messages the local fake SMTP server received. Admins only (the route's
 * guard; the API answers 401/403 to others) and development only (the API answers 404 elsewhere).
 */
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { DatePipe } from '@angular/common';
import { MatCardModule } from '@angular/material/card';
import { catchError, map, of } from 'rxjs';
import type { MailboxResponse } from '@shared/runs';
import { SweepApi } from './sweep-api';

/** The local mailbox. */
@Component({
  selector: 'app-sweep-mailbox',
  template: `
    <h1>Local mailbox</h1>
    <p class="note">E-mail sent while no SMTP_URL is set lands here instead of being delivered: everyone's sweep e-mail, so this page is for admins only, and it exists only in development (fake sign-in on this machine).</p>
    @if (messages(); as list) {
      @for (m of list; track m.id) {
        <mat-card appearance="outlined" class="mail">
          <mat-card-header><mat-card-title>{{ m.subject }}</mat-card-title>
            <mat-card-subtitle>to {{ m.to.join(', ') }} · {{ m.receivedAt | date: 'medium' }}</mat-card-subtitle></mat-card-header>
          <mat-card-content><pre>{{ m.text }}</pre></mat-card-content>
        </mat-card>
      } @empty { <p class="note">No messages yet.</p> }
    } @else if (messages() === null) {
      <p class="note">No local mailbox here: the fake SMTP server runs only in development (<code>npm start</code> with the fake sign-in on this machine and no SMTP_URL).</p>
    }
  `,
  styles: `.note { color: var(--mat-sys-on-surface-variant); } .mail { margin: 12px 0; } pre { white-space: pre-wrap; font: var(--mat-sys-body-medium); }`,
  imports: [DatePipe, MatCardModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SweepMailbox {
  private readonly api = inject(SweepApi);
  /** undefined while loading, null when no mailbox runs. */
  protected readonly messages = toSignal(this.api.mailbox().pipe(map((r): MailboxResponse['messages'] | null => r.messages), catchError(() => of(null))));
}

/** The banner under the top bar while the API's database is not answering (see DatabaseStatus). */
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { DatabaseStatus } from './database-status';

/** Says the database is down, that nobody was signed out, and that the app checks by itself. */
@Component({
  selector: 'app-database-banner',
  template: `
    @if (status.isUnavailable()) {
      <div class="banner" role="alert">
        <span><strong>The database is not answering.</strong> You are still signed in. Quarterturn checks again every few seconds
          and carries on when it is back; figures on this page may be out of date until then.</span>
        <button mat-button type="button" (click)="checkDatabase()">Check now</button>
      </div>
    }
  `,
  styles: `
    .banner {
      display: flex;
      align-items: center;
      gap: 1rem;
      padding: 0.5rem clamp(1rem, 4vw, 3rem);
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
      font: var(--mat-sys-body-medium);
    }
    span { flex: 1; }
  `,
  imports: [MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DatabaseBanner {
  protected readonly status = inject(DatabaseStatus);

  /** Asks the server at once instead of waiting for the next check. */
  protected checkDatabase(): void {
    this.status.checkNow();
  }
}

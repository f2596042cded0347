/** Start page: what Quarterturn is for, and how much the hub holds right now. */
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { DecimalPipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { catchError, of } from 'rxjs';
import type { StatsResponse } from '@shared/auth';
import { SIGN_IN_PATH } from '@shared/auth-contract';
import { StatsApi } from './stats-api';

/** One counter tile. */
interface Counter {
  readonly key: keyof StatsResponse;
  readonly label: string;
}

/** The counters in display order. */
const COUNTERS: readonly Counter[] = [
  { key: 'instanceSets', label: 'Instance sets' },
  { key: 'maps', label: 'Maps' },
  { key: 'scenarios', label: 'Scenarios' },
  { key: 'sweeps', label: 'Sweeps' },
  { key: 'results', label: 'Results' },
];

/** The page at `/`. */
@Component({
  selector: 'app-home',
  templateUrl: './home.html',
  styleUrl: './home.scss',
  imports: [DecimalPipe, MatButtonModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class Home {
  private readonly api = inject(StatsApi);
  protected readonly counters = COUNTERS;
  protected readonly signInUrl = SIGN_IN_PATH;
  /** Query parameter `signin`; the server's OAuth callback sets it to `failed` (SIGN_IN_FAILED_PATH). */
  readonly signin = input<string>();
  /** Whether the page was reached after a cancelled or refused sign-in. */
  protected readonly hasSignInFailed = computed(() => this.signin() === 'failed');
  /** undefined while loading, null when the request failed (the snack bar said why). */
  protected readonly stats = toSignal(this.api.stats().pipe(catchError(() => of(null))));
}

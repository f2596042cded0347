/** The page at /instance-sets: a searchable, server-paged table of the sets the viewer may see. */
import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { DatePipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { catchError, debounceTime, distinctUntilChanged, map, of, startWith, switchMap } from 'rxjs';
import type { InstanceSetDetail, InstanceSetListResponse } from '@shared/instance-sets';
import { Session } from '../core/session';
import { InstanceSetApi } from './instance-set-api';
import { InstanceSetCreateDialog } from './instance-set-create-dialog';

/** How long typing must pause before the search is sent. */
const SEARCH_DEBOUNCE_MS = 250;

/** The instance set table with search, paging and the create dialog. */
@Component({
  selector: 'app-instance-set-list',
  templateUrl: './instance-set-list.html',
  styleUrl: './instance-set-list.scss',
  imports: [DatePipe, RouterLink, MatTableModule, MatPaginatorModule, MatFormFieldModule, MatInputModule, MatButtonModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class InstanceSetList {
  private readonly api = inject(InstanceSetApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  protected readonly session = inject(Session);
  protected readonly columns = ['name', 'owner', 'visibility', 'mapCount', 'scenarioCount', 'updatedAt'];
  /** The search text as typed. */
  protected readonly searchText = signal('');
  protected readonly page = signal(1);
  protected readonly pageSize = signal(20);
  private readonly q = toSignal(toObservable(this.searchText).pipe(debounceTime(SEARCH_DEBOUNCE_MS), distinctUntilChanged()), { initialValue: '' });
  private readonly query = computed(() => ({ q: this.q(), page: this.page(), pageSize: this.pageSize() }));
  /** undefined while a page loads, null when it failed. */
  protected readonly result = toSignal(
    toObservable(this.query).pipe(
      switchMap((q) => this.api.list(q).pipe(
        map((r): InstanceSetListResponse | null | undefined => r),
        startWith(undefined),
        catchError(() => of(null)),
      )),
    ),
  );
  /** The last page that arrived, kept on screen while the next one loads. */
  protected readonly shown = linkedSignal<InstanceSetListResponse | null | undefined, InstanceSetListResponse | null>({
    source: this.result,
    computation: (r, previous) => r ?? previous?.value ?? null,
  });
  /** Whether a page is loading. */
  protected readonly isLoading = computed(() => this.result() === undefined);
  /** Whether the signed-in role may create sets. */
  protected readonly canCreate = computed(() => this.session.hasRole('researcher'));

  /** Takes the search box text; paging restarts at the first page. */
  protected searchFor(text: string): void {
    this.searchText.set(text);
    this.page.set(1);
  }

  /** Follows the paginator. */
  protected turnPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.page.set(event.pageIndex + 1);
  }

  /** Opens the create dialog and goes to the new set once it exists. */
  protected openCreateDialog(): void {
    this.dialog.open<InstanceSetCreateDialog, void, InstanceSetDetail>(InstanceSetCreateDialog).afterClosed().subscribe((set) => {
      if (set) void this.router.navigate(['/instance-sets', set.id]);
    });
  }
}

/**
 * The page at /sweeps/:id: progress bar, per-model counters, ETA and a live results grid,
 * fed from the sweep's SSE stream (an RxJS stream over EventSource) on top of the rows read at
 * load; and cancel. Row events sent before the stream connected (or while it was down) are
 * lost, so whenever a progress snapshot counts more finished runs than the grid holds, the
 * page reads the rows again. When the stream drops or the server loses its database, the page
 * says it lost contact (with the time of the last figures) instead of showing a time left that
 * no longer moves, until the next snapshot arrives.
 */
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { DatePipe } from '@angular/common';
import { AgGridAngular } from 'ag-grid-angular';
import { CellStyleModule, ClientSideRowModelModule, ModuleRegistry, TooltipModule, type GetRowIdParams } from 'ag-grid-community';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { auditTime, catchError, EMPTY, map, merge, of, Subject, switchMap } from 'rxjs';
import { CI95_METHOD } from '@shared/confidence-interval';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { profileLabel } from '@shared/leaderboards';
import { isSweepOver, RUN_STATUSES, type SweepDetail, type SweepProgress, type SweepResultRow } from '@shared/runs';
import { CBS_SWITCH_NAMES, CBS_SWITCH_TEXT, switchesOff } from '@shared/sweeps';
import { askToConfirm } from '../core/confirm-dialog';
import { followCellLinkOnEnter, leaveGridOnTab } from '../core/grid-keyboard';
import { SkipLink } from '../core/skip-link';
import { SweepApi, sweepDownloadUrls } from './sweep-api';
import { followingWarningFor } from './sweep-editor-advice';
import { SWEEP_GRID_THEME, sweepGridColumns } from './sweep-grid-columns';
import { formatDuration, RUN_STATUS_LABEL, SWEEP_STATUS_LABEL } from './sweep-status';

// CellStyleModule applies the cell classes of column types (right-aligned numbers); TooltipModule shows
// the columns' headerTooltip (without it AG Grid logs error #200 and drops the tooltip).
ModuleRegistry.registerModules([ClientSideRowModelModule, CellStyleModule, TooltipModule]);

/** What the page shows of one sweep. */
@Component({
  selector: 'app-sweep-detail',
  templateUrl: './sweep-detail.html',
  styleUrl: './sweep-detail.scss',
  imports: [DatePipe, RouterLink, AgGridAngular, SkipLink, MatButtonModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SweepDetailPage {
  private readonly api = inject(SweepApi);
  private readonly dialog = inject(MatDialog);
  /** Route parameter. */
  readonly id = input.required<string>();
  protected readonly statusLabel = SWEEP_STATUS_LABEL;
  protected readonly runLabel = RUN_STATUS_LABEL;
  protected readonly shownStatuses = RUN_STATUSES.filter((s) => s !== 'pending');
  protected readonly theme = SWEEP_GRID_THEME;
  /** Tab leaves the grid in one step; Enter on a Replay cell follows its link (core/grid-keyboard.ts). */
  protected readonly leaveOnTab = leaveGridOnTab;
  protected readonly followLink = followCellLinkOnEnter;
  protected readonly sweep = signal<SweepDetail | null | undefined>(undefined);
  protected readonly progress = signal<SweepProgress | null>(null);
  private readonly rowsById = signal<ReadonlyMap<number, SweepResultRow>>(new Map());
  /** Rows of runs that are over, newest run last. */
  protected readonly rows = computed(() => [...this.rowsById().values()].filter((r) => r.status !== 'pending' && r.status !== 'running'));
  protected readonly columns = computed(() => sweepGridColumns(this.sweep()?.definition.execution.policies ?? [], this.sweep()?.definition.models ?? []));
  protected readonly safetyNote = SAFETY_NOTE;
  /** The sweep's robot profile, for people. */
  protected readonly profile = computed(() => {
    const p = this.sweep()?.definition.robotProfile;
    return p ? profileLabel(p) : null;
  });
  /** The following hazard of the sweep's profile for its models (as the editor warned at launch). */
  protected readonly followingWarning = computed(() => {
    const d = this.sweep()?.definition;
    return d?.robotProfile ? followingWarningFor(d.robotProfile, d.models ?? []) : null;
  });
  /** The CBS improvements some model spec of the sweep turns off, by label with what that removes (an ablation). */
  protected readonly switchesOff = computed(() => {
    const names = new Set((this.sweep()?.definition.models ?? []).flatMap(switchesOff));
    return CBS_SWITCH_NAMES.filter((n) => names.has(n)).map((n) => CBS_SWITCH_TEXT[n]);
  });
  protected readonly rateMethod = CI95_METHOD.rate;
  protected readonly percent = computed(() => {
    const p = this.progress();
    return p && p.total > 0 ? (100 * p.done) / p.total : 0;
  });
  protected readonly eta = computed(() => {
    const ms = this.progress()?.etaMs;
    return ms === null || ms === undefined ? null : formatDuration(ms);
  });
  /** The sweep's download links (results CSV, plans zip). */
  protected readonly downloads = computed(() => sweepDownloadUrls(Number(this.id())));
  /** Whether the sweep can still be cancelled. */
  protected readonly isLive = computed(() => {
    const p = this.progress();
    return p !== null && !isSweepOver(p.status);
  });
  /** Whether the live figures stopped arriving (stream dropped or database unavailable). */
  protected readonly isOutOfContact = signal(false);
  /** When the last progress snapshot arrived. */
  protected readonly lastHeardAt = signal<Date | null>(null);
  protected readonly isCancelling = signal(false);
  protected readonly rowId = (p: GetRowIdParams<SweepResultRow>) => String(p.data.runId);
  /** Fires when the grid holds fewer finished runs than the latest progress snapshot counts. */
  private readonly rowsBehind = new Subject<void>();

  constructor() {
    toObservable(this.id).pipe(
      map(Number),
      switchMap((id) => {
        const readRows = () => this.api.results(id).pipe(map((r) => ({ kind: 'rows' as const, rows: r.items })), catchError(() => EMPTY));
        return merge(
          this.api.get(id).pipe(map((sweep) => ({ kind: 'sweep' as const, sweep })), catchError(() => of({ kind: 'missing' as const }))),
          readRows(),
          this.api.events(id).pipe(map((event) => ({ kind: 'event' as const, event }))),
          this.rowsBehind.pipe(auditTime(300), switchMap(readRows)),
        );
      }),
      takeUntilDestroyed(),
    ).subscribe((m) => {
      if (m.kind === 'missing') this.sweep.set(null);
      else if (m.kind === 'sweep') {
        this.sweep.set(m.sweep);
        if (!this.progress()) this.progress.set(m.sweep.progress);
      } else if (m.kind === 'rows') this.mergeRows(m.rows);
      else if (m.event.type === 'lost') this.isOutOfContact.set(true);
      else if (m.event.type === 'progress') {
        this.isOutOfContact.set(false);
        this.lastHeardAt.set(new Date());
        this.progress.set(m.event.progress);
        if (m.event.progress.done > this.rows().length) this.rowsBehind.next();
      } else this.mergeRows([m.event.row]);
    });
  }

  /** Asks whether to cancel (saying what stops and what stays), then asks the server to. */
  protected cancelSweep(): void {
    const s = this.sweep();
    const p = this.progress();
    if (!s || this.isCancelling()) return;
    askToConfirm(this.dialog, {
      title: `Cancel sweep “${s.name}”?`,
      consequences: [
        p ? `${p.total - p.done} of its ${p.total} runs are not over yet: they stop and will not be solved.`
          : 'Its runs that are not over yet stop and will not be solved.',
        `What the ${p ? `${p.done} ` : ''}runs already over found stays stored. A cancelled sweep cannot be resumed; to finish the work, launch a new sweep.`,
      ],
      act: 'Cancel sweep', keep: 'Keep it running', isDestructive: true,
    }).subscribe((isConfirmed) => {
      if (isConfirmed) this.sendCancel(s.id);
    });
  }

  private sendCancel(id: number): void {
    this.isCancelling.set(true);
    this.api.cancel(id).subscribe({
      next: (d) => {
        this.progress.set(d.progress);
        this.isCancelling.set(false);
      },
      error: () => this.isCancelling.set(false),
    });
  }

  private mergeRows(rows: readonly SweepResultRow[]): void {
    const next = new Map(this.rowsById());
    for (const r of rows) next.set(r.runId, r);
    this.rowsById.set(next);
  }
}

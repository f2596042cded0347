/** The page at /sweeps: the viewer's sweeps (maintainers see everyone's), newest first. */
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { DatePipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { catchError, map, of } from 'rxjs';
import type { SweepSummary } from '@shared/runs';
import { Session } from '../core/session';
import { SweepApi } from './sweep-api';
import { SWEEP_STATUS_LABEL } from './sweep-status';

/** The sweep table. */
@Component({
  selector: 'app-sweep-list',
  template: `
    <header class="head">
      <h1>Sweeps</h1>
      <span class="actions">
        <a mat-button routerLink="/sweeps/solvers">External solvers</a>
        @if (canLaunch()) { <a mat-flat-button routerLink="/sweeps/new">New sweep</a> }
      </span>
    </header>
    @if (sweeps(); as items) {
      @if (items.length === 0) {
        <p class="empty">No sweeps yet.@if (canLaunch()) { Start one with <a routerLink="/sweeps/new">New sweep</a>.} @else if (isSignedIn()) {
          Maintainers launch sweeps: ask one to run yours, or ask an admin for the maintainer role.}</p>
      } @else {
        <table mat-table [dataSource]="items" aria-label="Sweeps">
          <ng-container matColumnDef="name"><th mat-header-cell *matHeaderCellDef>Name</th>
            <td mat-cell *matCellDef="let s"><a [routerLink]="['/sweeps', s.id]">{{ s.name }}</a></td></ng-container>
          <ng-container matColumnDef="owner"><th mat-header-cell *matHeaderCellDef>Launched by</th><td mat-cell *matCellDef="let s">{{ s.owner.login }}</td></ng-container>
          <ng-container matColumnDef="status"><th mat-header-cell *matHeaderCellDef>Status</th><td mat-cell *matCellDef="let s">{{ statusText(s) }}</td></ng-container>
          <ng-container matColumnDef="progress"><th mat-header-cell *matHeaderCellDef>Runs</th>
            <td mat-cell *matCellDef="let s"><span class="runs">{{ s.done }} / {{ s.total }}</span>
              <mat-progress-bar mode="determinate" [value]="s.total ? (100 * s.done) / s.total : 0" [attr.aria-label]="'Runs done of ' + s.name" /></td></ng-container>
          <ng-container matColumnDef="created"><th mat-header-cell *matHeaderCellDef>Launched</th><td mat-cell *matCellDef="let s">{{ s.createdAt | date: 'medium' }}</td></ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr mat-row *matRowDef="let row; columns: columns"></tr>
        </table>
      }
    } @else if (sweeps() === null) {
      <p class="empty">The sweeps could not be loaded.</p>
    } @else {
      <mat-progress-bar mode="indeterminate" aria-label="Loading sweeps" />
    }
  `,
  styles: `
    .head { display: flex; align-items: center; justify-content: space-between; }
    .actions { display: flex; gap: 8px; }
    table { width: 100%; }
    .runs { font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
    .empty { color: var(--mat-sys-on-surface-variant); }
  `,
  imports: [DatePipe, RouterLink, MatTableModule, MatButtonModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SweepList {
  private readonly api = inject(SweepApi);
  private readonly session = inject(Session);
  protected readonly columns = ['name', 'owner', 'status', 'progress', 'created'];
  /** undefined while loading, null on failure. */
  protected readonly sweeps = toSignal(this.api.list().pipe(map((r): readonly SweepSummary[] | null => r.items), catchError(() => of(null))));
  /** The status of a row in words (the mat-table row context is untyped). */
  protected statusText(s: SweepSummary): string {
    return SWEEP_STATUS_LABEL[s.status];
  }
  /** Whether the viewer may launch sweeps (maintainers and admins run the shared workers). */
  protected readonly canLaunch = computed(() => this.session.hasRole('maintainer'));
  /** Whether someone is signed in (a researcher is told how to get a sweep run; a visitor is not). */
  protected readonly isSignedIn = this.session.isSignedIn;
}

/**
 * The page at /instance-sets/:id: the set's facts, the upload panel with a real progress bar and
 * the problems of a refused upload by file, line and column, map previews, the scenario table
 * and the generator form. Those who may manage the set change its name, description, source and
 * visibility in a dialog, and delete one map or scenario after a dialog says what goes with it.
 */
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { DecimalPipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { catchError, combineLatest, firstValueFrom, forkJoin, map, of, switchMap } from 'rxjs';
import type { InstanceSetDetail, MapDetail, UploadResponse } from '@shared/instance-sets';
import { MapThumbnail } from '../maps/map-thumbnail';
import { DeletionDialog, type DeletionTarget } from './deletion-dialog';
import { FileDropZone } from './file-drop-zone';
import { GeneratorForm } from './generator-form';
import { InstanceSetApi } from './instance-set-api';
import { InstanceSetEditDialog } from './instance-set-edit-dialog';
import { problemPlace, stateAfterError, stateAfterEvent, type UploadState } from './upload-outcome';

/** Previews are drawn for this many maps; the rest are listed by name (each preview loads the map's cells). */
const PREVIEW_LIMIT = 24;

/** One instance set. */
@Component({
  selector: 'app-instance-set-detail',
  templateUrl: './instance-set-detail.html',
  styleUrl: './instance-set-detail.scss',
  imports: [DecimalPipe, RouterLink, MatTableModule, MatButtonModule, MatProgressBarModule, MatExpansionModule, FileDropZone, GeneratorForm, MapThumbnail],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class InstanceSetDetailPage {
  private readonly api = inject(InstanceSetApi);
  private readonly router = inject(Router);
  private readonly destroyRef = inject(DestroyRef);
  private readonly dialog = inject(MatDialog);
  /** Route parameter. */
  readonly id = input.required<string>();
  private readonly reloads = signal(0);
  /** undefined while loading, null when it failed (missing or private). */
  protected readonly set = toSignal(
    combineLatest([toObservable(this.id), toObservable(this.reloads)]).pipe(
      switchMap(([id]) => this.api.get(Number(id)).pipe(catchError(() => of(null)))),
    ),
  );
  /** Cells of the first PREVIEW_LIMIT maps, by map id. */
  protected readonly previews = toSignal(
    toObservable(this.set).pipe(
      switchMap((s) => {
        const maps = s?.maps.slice(0, PREVIEW_LIMIT) ?? [];
        if (maps.length === 0) return of(new Map<number, MapDetail>());
        return forkJoin(maps.map((m) => this.api.map(m.id).pipe(catchError(() => of(null))))).pipe(
          map((list) => new Map(list.filter((m): m is MapDetail => m !== null).map((m) => [m.id, m]))),
        );
      }),
    ),
    { initialValue: new Map<number, MapDetail>() },
  );
  protected readonly upload = signal<UploadState>({ kind: 'idle' });
  protected readonly isUploading = computed(() => this.upload().kind === 'sending');
  protected readonly mapNames = computed(() => new Map((this.set()?.maps ?? []).map((m) => [m.id, m.name])));
  protected readonly scenarioColumns = ['name', 'map', 'rowCount', 'maxAgents', 'download', 'remove'];
  /** What the last file deletion did, for the status line. */
  protected readonly removal = signal<string | null>(null);
  protected readonly problemColumns = ['file', 'place', 'message'];
  protected readonly problemPlace = problemPlace;
  protected readonly previewLimit = PREVIEW_LIMIT;

  /** Uploads the files of one drop or pick at once, following the progress events. */
  protected uploadFiles(set: InstanceSetDetail, files: File[]): void {
    this.upload.set({ kind: 'sending', fileCount: files.length, percent: 0 });
    this.api.upload(set.id, files).pipe(takeUntilDestroyed(this.destroyRef)).subscribe({
      next: (event) => {
        const next = stateAfterEvent(event, files.length);
        if (next) this.upload.set(next);
        if (next?.kind === 'stored') this.reloads.update((n) => n + 1);
      },
      error: (err: unknown) => this.upload.set(stateAfterError(err)),
    });
  }

  /** After the generator stored files: say so and reload. */
  protected showGenerated(result: UploadResponse): void {
    this.upload.set({ kind: 'stored', result });
    this.reloads.update((n) => n + 1);
  }

  /** Opens the edit dialog and shows the changed set. */
  protected editSet(set: InstanceSetDetail): void {
    this.dialog.open<InstanceSetEditDialog, InstanceSetDetail, InstanceSetDetail>(InstanceSetEditDialog, { data: set })
      .afterClosed().pipe(takeUntilDestroyed(this.destroyRef)).subscribe((changed) => {
        if (changed) this.reloads.update((n) => n + 1);
      });
  }

  /** Asks (saying what goes with it), then deletes one map or scenario and reloads the set. */
  protected removeFile(kind: 'maps' | 'scenarios', id: number, name: string): void {
    const target = { kind, id, name };
    this.dialog.open<DeletionDialog, DeletionTarget, boolean>(DeletionDialog, { data: target })
      .afterClosed().pipe(takeUntilDestroyed(this.destroyRef)).subscribe(async (confirmed) => {
        if (!confirmed) return;
        try {
          await firstValueFrom(this.api.removeFile(target.kind, target.id));
          this.removal.set(`Deleted ${target.kind === 'maps' ? 'map' : 'scenario'} ${target.name}.`);
        } catch {
          // The error interceptor has said why; the set is reloaded either way, so the page shows what is stored.
        }
        this.reloads.update((n) => n + 1);
      });
  }

  /** Asks (saying what goes with it), then deletes the set and returns to the table. */
  protected deleteSet(set: InstanceSetDetail): void {
    this.dialog.open<DeletionDialog, DeletionTarget, boolean>(DeletionDialog, { data: { kind: 'instance-sets', id: set.id, name: set.name } })
      .afterClosed().pipe(takeUntilDestroyed(this.destroyRef)).subscribe(async (confirmed) => {
        if (!confirmed) return;
        try {
          await firstValueFrom(this.api.remove(set.id));
          await this.router.navigate(['/instance-sets']);
        } catch {
          // The error interceptor has said why; the set stays on screen.
        }
      });
  }

  protected downloadUrl(kind: 'maps' | 'scenarios', id: number): string {
    return this.api.downloadUrl(kind, id);
  }

  /** The set's files as one zip (GET /api/instance-sets/:id/archive). */
  protected archiveUrl(id: number): string {
    return this.api.archiveUrl(id);
  }
}

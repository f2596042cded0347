/**
 * The batch part of the submissions page (issue 16, item 3): send a zip (batch.json and the plan
 * files) or a JSON manifest whose plans carry their text; the server checks the batch as a whole
 * first (a refusal shows its file, line and field), then each plan in the background. While it
 * runs the page asks for its progress every second and shows a bar; the outcome table gives each
 * plan's figures and execution success rates, or why it was refused. Past batches can be shown again.
 */
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { rxResource, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { PercentPipe } from '@angular/common';
import { RouterLink } from '@angular/router';
import { EMPTY, catchError, exhaustMap, firstValueFrom, of, switchMap, takeWhile, tap, timer } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { schemaUrl } from '@shared/help';
import type { SubmissionBatchSummary } from '@shared/submission-batches';
import { SubmissionApi } from './submission-api';
import { batchProgress, outcomeRows, readJsonBatchFile } from './batch-outcomes';
import { fileCaption, problemOf, type SubmissionProblem } from './submission-rules';

/** How often a running batch is asked for its progress, ms. */
export const BATCH_POLL_MS = 1000;

@Component({
  selector: 'app-batch-upload',
  templateUrl: './batch-upload.html',
  styleUrl: './batch-upload.scss',
  imports: [RouterLink, PercentPipe, MatButtonModule, MatProgressBarModule, MatTableModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class BatchUpload {
  private readonly api = inject(SubmissionApi);

  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly schemaUrl = schemaUrl('submission-batch-format.schema.json');
  protected readonly columns = ['position', 'source', 'instance', 'outcome', 'details', 'open'];
  protected readonly file = signal<File | null>(null);
  protected readonly isSending = signal(false);
  protected readonly problem = signal<SubmissionProblem | null>(null);
  /** The batch on show: the one just sent or one picked from the list. */
  protected readonly shownId = signal<number | null>(null);
  protected readonly mine = rxResource({ stream: () => this.api.batches() });

  /** The shown batch, asked again every BATCH_POLL_MS while it runs (the last answer, 'done', is kept). */
  protected readonly batch = toSignal(toObservable(this.shownId).pipe(
    switchMap((id) => (id === null ? of(null) : timer(0, BATCH_POLL_MS).pipe(
      // A slow answer is awaited rather than cancelled by the next tick; a failed poll (the error interceptor reports it) is skipped.
      exhaustMap(() => this.api.batch(id).pipe(catchError(() => EMPTY))),
      takeWhile((b) => b.status === 'running', true),
      tap((b) => {
        if (b.status === 'done') this.mine.reload();
      }),
    ))),
  ), { initialValue: null });
  protected readonly progress = computed(() => {
    const b = this.batch();
    return b ? batchProgress(b) : null;
  });
  protected readonly rows = computed(() => outcomeRows(this.batch()?.entries ?? []));
  /** Whether execution figures show (then the safety note shows with them). */
  protected readonly hasExecutions = computed(() => this.rows().some((r) => r.rates.length > 0));

  protected chooseFile(event: Event): void {
    const input = event.target as HTMLInputElement;
    this.file.set(input.files?.[0] ?? null);
    this.problem.set(null);
    // The same file can be chosen again after an edit.
    input.value = '';
  }

  protected caption(f: File): string {
    return fileCaption(f.name, f.size);
  }

  protected async sendBatch(): Promise<void> {
    const file = this.file();
    if (!file) return;
    this.isSending.set(true);
    this.problem.set(null);
    try {
      let sent: SubmissionBatchSummary;
      if (file.name.toLowerCase().endsWith('.json')) {
        const read = readJsonBatchFile(await file.text());
        if (!read.ok) {
          this.problem.set({ kind: 'other', message: read.message });
          return;
        }
        sent = await firstValueFrom(this.api.sendBatchJson(read.manifest));
      } else {
        sent = await firstValueFrom(this.api.sendBatchZip(file));
      }
      this.file.set(null);
      this.shownId.set(sent.id);
      this.mine.reload();
    } catch (err) {
      this.problem.set(problemOf(err instanceof HttpErrorResponse ? err.error : null));
    } finally {
      this.isSending.set(false);
    }
  }

  protected showBatch(id: number): void {
    this.shownId.set(id);
  }
}

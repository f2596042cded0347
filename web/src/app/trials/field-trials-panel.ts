/**
 * The "Field trials" panel of a stored result's page (/plans/view?result=ID): the runs attached to
 * the result, each with its figures beside the simulation's (central 95 % of simulated runs under
 * the policy the fleet used), flags where a field figure falls outside, two charts, and for
 * researchers a form to attach logs (CSV, JSON or a zip of them) with the policy and notes.
 */
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { firstValueFrom } from 'rxjs';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { EXECUTION_POLICY_NAMES, SAFETY_NOTE, type ExecutionPolicyName } from '@shared/executions-constants';
import { INVENTED_TRIALS_MARK, type FieldTrialsView, type FieldTrialUpload } from '@shared/field-trials';
import { errorMessage } from '../core/error-message';
import {
  delaysText, durationChart, makespanChart, outsideText, problemLines, rangeText, seconds,
} from './field-trials-figures';
import { ProfileFit } from './profile-fit';
import { TrialRangeChart } from './trial-range-chart';
import { TrialsApi } from './trials-api';

const CHART_WIDTH = 420;

@Component({
  selector: 'app-field-trials-panel',
  templateUrl: './field-trials-panel.html',
  styleUrl: './field-trials-panel.scss',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, TrialRangeChart, ProfileFit],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FieldTrialsPanel {
  private readonly api = inject(TrialsApi);
  /** The stored result whose trials are shown. */
  readonly resultId = input.required<number>();

  protected readonly view = signal<FieldTrialsView | null>(null);
  protected readonly loadProblem = signal<string | null>(null);
  protected readonly isSending = signal(false);
  protected readonly sendProblem = signal<{ message: string; lines: string[] } | null>(null);
  protected readonly sent = signal<string | null>(null);
  protected readonly files = signal<readonly File[]>([]);
  /** The chosen files' names, for the picker's caption. */
  protected readonly fileNames = computed(() => this.files().map((f) => f.name).join(', '));
  protected policy: ExecutionPolicyName = 'dependency-gated';
  protected notes = '';
  protected readonly policies = EXECUTION_POLICY_NAMES;
  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly seconds = seconds;
  protected readonly rangeText = rangeText;
  protected readonly outsideText = outsideText;
  protected readonly delaysText = delaysText;

  constructor() {
    effect(() => {
      void this.load(this.resultId());
    });
  }

  protected makespanChart(u: FieldTrialUpload) {
    return makespanChart(u, CHART_WIDTH);
  }
  protected durationChart(u: FieldTrialUpload) {
    return durationChart(u, CHART_WIDTH);
  }
  protected isInvented(u: FieldTrialUpload): boolean {
    return u.notes.startsWith(INVENTED_TRIALS_MARK);
  }
  protected runCount(v: FieldTrialsView): number {
    return v.uploads.reduce((n, u) => n + u.runs.length, 0);
  }
  protected successText(u: FieldTrialUpload): string {
    const ok = u.runs.filter((r) => r.isSuccess).length;
    return `${ok} of ${u.runs.length} field runs succeeded; simulated success rate ${(u.simulation.successRate * 100).toFixed(0)} %`;
  }

  protected pick(event: Event): void {
    const list = (event.target as HTMLInputElement).files;
    this.files.set(list ? Array.from(list) : []);
  }

  protected async attach(): Promise<void> {
    const files = this.files();
    if (files.length === 0) return;
    this.isSending.set(true);
    this.sendProblem.set(null);
    this.sent.set(null);
    try {
      const answer = await firstValueFrom(this.api.attach(this.resultId(), files, this.policy, this.notes));
      const runs = answer.uploads[0]?.runs.length ?? 0;
      this.sent.set(`Stored ${runs} field run${runs === 1 ? '' : 's'}.`);
      this.files.set([]);
      this.notes = '';
      await this.load(this.resultId());
    } catch (err) {
      const details = err instanceof HttpErrorResponse ? (err.error as { error?: { details?: unknown } } | null)?.error?.details : undefined;
      this.sendProblem.set({ message: errorMessage(err), lines: problemLines(details) });
    } finally {
      this.isSending.set(false);
    }
  }

  private async load(resultId: number): Promise<void> {
    try {
      this.view.set(await firstValueFrom(this.api.list(resultId)));
      this.loadProblem.set(null);
    } catch (err) {
      this.loadProblem.set(errorMessage(err));
    }
  }
}

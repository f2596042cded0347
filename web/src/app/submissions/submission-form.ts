/**
 * Submit a plan computed elsewhere: pick the format, give the scenario, agent count and plan
 * model (text format; a JSON plan document names them itself) and the solver, paste or load the
 * file. The model's validator judges it on the server; a rejected plan shows its first violation
 * (agents, time, cell), an accepted one its figures and a link to the board.
 */
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { rxResource } from '@angular/core/rxjs-interop';
import { DecimalPipe, PercentPipe } from '@angular/common';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { schemaUrl } from '@shared/help';
import type { SubmissionRequest } from '@shared/plan-format';
import type { SubmissionView } from '@shared/submissions';
import { SubmissionApi } from './submission-api';
import { problemOf, TEXT_MODELS, type SubmissionProblem } from './submission-rules';

@Component({
  selector: 'app-submission-form',
  templateUrl: './submission-form.html',
  styleUrl: './submission-form.scss',
  imports: [
    ReactiveFormsModule, RouterLink, DecimalPipe, PercentPipe, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatInputModule, MatSelectModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SubmissionForm {
  private readonly api = inject(SubmissionApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly models = TEXT_MODELS;
  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly planSchemaUrl = schemaUrl('plan-format.schema.json');
  protected readonly form = this.fb.group({
    format: this.fb.control<'text' | 'json'>('text'),
    scenarioId: this.fb.control(1, [Validators.required, Validators.min(1)]),
    agents: this.fb.control(1, [Validators.required, Validators.min(1)]),
    model: this.fb.control<(typeof TEXT_MODELS)[number]>('classic'),
    k: this.fb.control(1, [Validators.min(0), Validators.max(20)]),
    solverName: this.fb.control('', [Validators.required, Validators.maxLength(120)]),
    solverVersion: this.fb.control('', [Validators.required, Validators.maxLength(64)]),
    fileName: this.fb.control(''),
    text: this.fb.control('', [Validators.required]),
  });
  protected readonly format = signal<'text' | 'json'>('text');
  protected readonly isSending = signal(false);
  protected readonly accepted = signal<SubmissionView | null>(null);
  protected readonly problem = signal<SubmissionProblem | null>(null);
  protected readonly mine = rxResource({ stream: () => this.api.list() });
  protected readonly isText = computed(() => this.format() === 'text');

  protected chooseFormat(format: 'text' | 'json'): void {
    this.format.set(format);
    this.form.controls.format.setValue(format);
  }

  protected async loadFile(event: Event): Promise<void> {
    const file = (event.target as HTMLInputElement).files?.[0];
    if (!file) return;
    this.form.patchValue({ text: await file.text(), fileName: file.name });
    if (file.name.endsWith('.json')) this.chooseFormat('json');
  }

  private request(): SubmissionRequest {
    const v = this.form.getRawValue();
    const fileName = v.fileName.trim() || undefined;
    if (v.format === 'json') return { format: 'json', text: v.text, ...(fileName ? { fileName } : {}) };
    return {
      format: 'text', text: v.text, ...(fileName ? { fileName } : {}), model: v.model, startHeading: 'free',
      ...(v.model === 'k-robust' ? { k: v.k } : {}),
      instance: { scenarioId: v.scenarioId, agents: v.agents },
      solver: { name: v.solverName, version: v.solverVersion },
    };
  }

  protected async send(): Promise<void> {
    const isJson = this.form.controls.format.value === 'json';
    // The JSON document carries the instance and solver itself.
    const needed = isJson ? [this.form.controls.text] : Object.values(this.form.controls);
    if (needed.some((c) => c.invalid)) {
      this.form.markAllAsTouched();
      return;
    }
    this.isSending.set(true);
    this.problem.set(null);
    this.accepted.set(null);
    try {
      this.accepted.set(await firstValueFrom(this.api.submit(this.request())));
      this.mine.reload();
    } catch (err) {
      this.problem.set(problemOf(err instanceof HttpErrorResponse ? err.error : null));
    } finally {
      this.isSending.set(false);
    }
  }
}

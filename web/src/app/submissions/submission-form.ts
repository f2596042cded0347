/**
 * Submit a plan computed elsewhere. For the text format the researcher picks the instance from
 * lists: instance set (those he may see), map, scenario (by name) and agent count (bounded by the
 * scenario), then the plan model. For a JSON plan document, which names its instance itself, the
 * form reads the instance from the text. Either way it offers the robot profiles the instance's
 * stored results use, the most used first (the starter profile when there are none), and sends
 * the chosen one, so the plan is scored beside the results it is compared with. The model's
 * validator judges the plan on the server; a rejected plan shows its first violation (agents,
 * time, cell), an accepted one its figures, the profile they were computed under and a link to the board.
 */
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal } from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
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
import { InstanceSetApi } from '../instance-sets/instance-set-api';
import { SubmissionApi } from './submission-api';
import { fileCaption, peekPlanDocument, problemOf, TEXT_MODELS, type SubmissionProblem } from './submission-rules';
import { MiddleEllipsisPipe } from '../core/middle-ellipsis.pipe';
import BatchUpload from './batch-upload';

/** Sets offered in the first list (the API's largest page). */
const SET_PAGE_SIZE = 100;

@Component({
  selector: 'app-submission-form',
  templateUrl: './submission-form.html',
  styleUrl: './submission-form.scss',
  imports: [
    BatchUpload, MiddleEllipsisPipe, ReactiveFormsModule, RouterLink, DecimalPipe, PercentPipe, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatInputModule, MatSelectModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SubmissionForm {
  private readonly api = inject(SubmissionApi);
  private readonly library = inject(InstanceSetApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly models = TEXT_MODELS;
  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly planSchemaUrl = schemaUrl('plan-format.schema.json');
  protected readonly form = this.fb.group({
    format: this.fb.control<'text' | 'json'>('text'),
    setId: this.fb.control<number | null>(null, Validators.required),
    mapId: this.fb.control<number | null>(null, Validators.required),
    scenarioId: this.fb.control<number | null>(null, Validators.required),
    agents: this.fb.control(1, [Validators.required, Validators.min(1)]),
    model: this.fb.control<(typeof TEXT_MODELS)[number]>('classic'),
    k: this.fb.control(1, [Validators.min(0), Validators.max(20)]),
    /** Index into the offered profiles; 0 is the default. */
    profile: this.fb.control(0),
    solverName: this.fb.control('', [Validators.required, Validators.maxLength(120)]),
    solverVersion: this.fb.control('', [Validators.required, Validators.maxLength(64)]),
    text: this.fb.control('', [Validators.required]),
  });
  protected readonly format = signal<'text' | 'json'>('text');
  protected readonly isText = computed(() => this.format() === 'text');
  protected readonly isSending = signal(false);
  protected readonly accepted = signal<SubmissionView | null>(null);
  protected readonly problem = signal<SubmissionProblem | null>(null);
  protected readonly mine = rxResource({ stream: () => this.api.list() });
  /** The loaded file: its name goes with the request (error messages name it), the caption shows beside the button. */
  protected readonly file = signal<{ name: string; caption: string } | null>(null);

  private readonly setId = toSignal(this.form.controls.setId.valueChanges, { initialValue: null });
  private readonly mapId = toSignal(this.form.controls.mapId.valueChanges, { initialValue: null });
  private readonly scenarioId = toSignal(this.form.controls.scenarioId.valueChanges, { initialValue: null });
  private readonly agents = toSignal(this.form.controls.agents.valueChanges, { initialValue: 1 });
  private readonly text = toSignal(this.form.controls.text.valueChanges, { initialValue: '' });

  /** The sets the viewer may see (the API leaves out private sets of others). */
  protected readonly sets = rxResource({ stream: () => this.library.list({ q: '', page: 1, pageSize: SET_PAGE_SIZE }) });
  protected readonly setDetail = rxResource({
    params: () => this.setId() ?? undefined,
    stream: ({ params }) => this.library.get(params),
  });
  protected readonly maps = computed(() => this.setDetail.value()?.maps ?? []);
  protected readonly scenarios = computed(() => (this.setDetail.value()?.scenarios ?? []).filter((c) => c.mapId === this.mapId()));
  protected readonly scenario = computed(() => this.scenarios().find((c) => c.id === this.scenarioId()) ?? null);

  /** What a JSON document names, read as it is pasted or loaded. */
  protected readonly peek = computed(() => (this.isText() ? null : peekPlanDocument(this.text())));
  /** The instance whose results decide the offered profiles; undefined while it is not known. */
  private readonly profileInstance = computed(() => {
    if (this.isText()) {
      const scenario = this.scenario();
      const agents = this.agents();
      return scenario && Number.isInteger(agents) && agents >= 1 && agents <= scenario.maxAgents ? { scenarioId: scenario.id, agents } : undefined;
    }
    const peek = this.peek();
    return peek && !peek.robotProfile ? { scenarioId: peek.scenarioId, agents: peek.agents } : undefined;
  });
  protected readonly profiles = rxResource({
    params: () => this.profileInstance(),
    stream: ({ params }) => this.api.profiles(params.scenarioId, params.agents),
  });
  protected readonly profileOptions = computed(() => this.profiles.value()?.items ?? []);

  constructor() {
    // A new set clears map and scenario; a new map clears the scenario (they would name another set's files).
    this.form.controls.setId.valueChanges.subscribe(() => this.form.patchValue({ mapId: null, scenarioId: null }));
    this.form.controls.mapId.valueChanges.subscribe(() => this.form.controls.scenarioId.setValue(null));
    // The agent count is bounded by the scenario: at most its largest usable k.
    effect(() => {
      const scenario = this.scenario();
      const agents = this.form.controls.agents;
      agents.setValidators([Validators.required, Validators.min(1), ...(scenario ? [Validators.max(scenario.maxAgents)] : [])]);
      if (scenario && agents.value > scenario.maxAgents) agents.setValue(scenario.maxAgents);
      agents.updateValueAndValidity({ emitEvent: false });
    });
    // Each new list of profiles starts at its default, the most used one.
    effect(() => {
      this.profileOptions();
      this.form.controls.profile.setValue(0);
    });
  }

  protected chooseFormat(format: 'text' | 'json'): void {
    this.format.set(format);
    this.form.controls.format.setValue(format);
  }

  protected async loadFile(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) return;
    this.form.controls.text.setValue(await file.text());
    this.file.set({ name: file.name, caption: fileCaption(file.name, file.size) });
    if (file.name.endsWith('.json')) this.chooseFormat('json');
    // The same file can be chosen again after an edit.
    input.value = '';
  }

  /** The chosen profile, or undefined when the server should use the document's (or none is offered yet). */
  private chosenProfile() {
    return this.profileOptions()[this.form.controls.profile.value]?.profile;
  }

  private request(): SubmissionRequest {
    const v = this.form.getRawValue();
    const fileName = this.file()?.name;
    const robotProfile = this.chosenProfile();
    const common = { text: v.text, ...(fileName ? { fileName } : {}), ...(robotProfile ? { robotProfile } : {}) };
    if (v.format === 'json') return { format: 'json', ...common };
    return {
      format: 'text', ...common, model: v.model, startHeading: 'free',
      ...(v.model === 'k-robust' ? { k: v.k } : {}),
      instance: { scenarioId: v.scenarioId ?? 0, agents: v.agents },
      solver: { name: v.solverName, version: v.solverVersion },
    };
  }

  protected async send(): Promise<void> {
    const c = this.form.controls;
    // The JSON document carries the instance and solver itself.
    const needed = this.isText() ? [c.setId, c.mapId, c.scenarioId, c.agents, c.k, c.solverName, c.solverVersion, c.text] : [c.text];
    const isProfileMissing = this.isText() && !this.chosenProfile();
    if (needed.some((ctl) => ctl.invalid) || isProfileMissing) {
      this.form.markAllAsTouched();
      return;
    }
    this.isSending.set(true);
    this.problem.set(null);
    this.accepted.set(null);
    try {
      this.accepted.set(await firstValueFrom(this.api.submit(this.request())));
      this.mine.reload();
      this.profiles.reload();
    } catch (err) {
      this.problem.set(problemOf(err instanceof HttpErrorResponse ? err.error : null));
    } finally {
      this.isSending.set(false);
    }
  }
}

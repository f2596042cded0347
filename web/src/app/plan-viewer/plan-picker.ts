/**
 * Choosing what to view: instance set → scenario → number of agents → plan model (and a second
 * model to compare) → start heading and robot profile. Emits the choice; the page solves it.
 * When the page shows a plan opened another way (a stored result or execution), the form takes
 * its instance, model and profile, so comparing it with a second model is one click.
 */
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule, NonNullableFormBuilder, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { catchError, of } from 'rxjs';
import { EXECUTION_LIMITS, STARTER_PROFILE } from '@shared/executions-constants';
import type { PaneExecution } from './viewer-pane';
import type { InstanceSetDetail } from '@shared/instance-sets';
import { HEADINGS, PLAN_MODELS, type PlanModel, type RobotProfile, type StartHeading } from '@shared/plan';
import { InstanceSetApi } from '../instance-sets/instance-set-api';
import { middleEllipsis } from '../core/middle-ellipsis';
import { MiddleEllipsisPipe } from '../core/middle-ellipsis.pipe';

/** What the picker asks the page to open. */
export interface PlanChoice {
  readonly scenarioId: number;
  readonly agents: number;
  readonly models: readonly PlanModel[];
  readonly startHeading: StartHeading;
  readonly profile: RobotProfile;
}

/** The instance and model chooser. */
@Component({
  selector: 'app-plan-picker',
  templateUrl: './plan-picker.html',
  styleUrl: './plan-picker.scss',
  imports: [MiddleEllipsisPipe, ReactiveFormsModule, MatFormFieldModule, MatSelectModule, MatInputModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanPicker {
  private readonly api = inject(InstanceSetApi);
  private readonly fb = inject(NonNullableFormBuilder);
  /** Emitted with the choice when the user opens it. */
  readonly openPlan = output<PlanChoice>();
  /** The execution the page shows first, if any: the form takes its instance, model and profile. */
  readonly shown = input<PaneExecution | null>(null);
  /** Whether this account may have the server solve (researchers and up); visitors see the form but cannot submit it. */
  readonly canSolve = input(true);
  protected readonly models = PLAN_MODELS;
  protected readonly headings = ['free', ...HEADINGS] as const;
  protected readonly maxSolveAgents = EXECUTION_LIMITS.maxSolveAgents;
  protected readonly sets = toSignal(this.api.list({ q: '', page: 1, pageSize: 100 }).pipe(catchError(() => of(null))));
  protected readonly set = signal<InstanceSetDetail | null>(null);
  protected readonly form = this.fb.group({
    setId: this.fb.control<number | null>(null, Validators.required),
    scenarioId: this.fb.control<number | null>(null, Validators.required),
    agents: this.fb.control(4, [Validators.required, Validators.min(1), Validators.max(EXECUTION_LIMITS.maxSolveAgents)]),
    model: this.fb.control<PlanModel>('classic'),
    compare: this.fb.control<PlanModel | 'none'>('none'),
    startHeading: this.fb.control<StartHeading>('free'),
    forwardMs: this.fb.control(STARTER_PROFILE.forwardMs, [Validators.required, Validators.min(1)]),
    quarterTurnMs: this.fb.control(STARTER_PROFILE.quarterTurnMs, [Validators.required, Validators.min(1)]),
    waitMs: this.fb.control(STARTER_PROFILE.waitMs, [Validators.required, Validators.min(1)]),
    cellPitchMm: this.fb.control(STARTER_PROFILE.cellPitchMm, [Validators.required, Validators.min(1)]),
    robotDiameterMm: this.fb.control(STARTER_PROFILE.robotDiameterMm, [Validators.required, Validators.min(1)]),
  });
  protected readonly scenarios = computed(() => this.set()?.scenarios ?? []);
  /** A scenario name cut in the middle to fit the select, keeping its distinguishing end (the option's title holds it whole). */
  protected shortName(name: string): string {
    return middleEllipsis(name, 32);
  }

  /** Key of the execution (or result plan) last adopted: re-runs of it keep what the user changed since. */
  private adoptedKey: string | null = null;

  constructor() {
    effect(() => {
      const e = this.shown();
      const key = e ? (e.id !== undefined ? `execution ${e.id}` : `result ${e.source.resultId}`) : null;
      if (e && key !== this.adoptedKey) {
        this.adoptedKey = key;
        untracked(() => this.adopt(e));
      }
    });
  }

  /** Fills the form from a shown execution of a stored scenario (tasks sent with a map have no scenario to pick). */
  private adopt(e: PaneExecution): void {
    const { instanceSetId, scenarioId } = e.source;
    if (scenarioId === undefined) return;
    const p = e.profile;
    // The second model stays as chosen: solving a comparison shows its first plan here, and the
    // picker must not forget the comparison it just asked for. Only a clash with the shown model clears it.
    const compare = this.form.controls.compare.value === e.model ? 'none' : this.form.controls.compare.value;
    this.form.patchValue({
      setId: instanceSetId, agents: e.instance.agents.length, model: e.model, compare, startHeading: e.modelOptions.startHeading,
      forwardMs: p.forwardMs, quarterTurnMs: p.quarterTurnMs, waitMs: p.waitMs, cellPitchMm: p.cellPitchMm, robotDiameterMm: p.robotDiameterMm,
    });
    this.api.get(instanceSetId).pipe(catchError(() => of(null))).subscribe((detail) => {
      this.set.set(detail);
      if (detail?.scenarios.some((s) => s.id === scenarioId)) this.form.controls.scenarioId.setValue(scenarioId);
    });
  }

  /** Loads the chosen set's scenarios. */
  protected chooseSet(id: number): void {
    this.form.controls.scenarioId.setValue(null);
    this.set.set(null);
    this.api.get(id).pipe(catchError(() => of(null))).subscribe((detail) => this.set.set(detail));
  }

  /** Emits the choice. */
  protected openChoice(): void {
    const v = this.form.getRawValue();
    if (this.form.invalid || v.scenarioId === null || !this.canSolve()) return;
    const models: PlanModel[] = [v.model];
    if (v.compare !== 'none' && v.compare !== v.model) models.push(v.compare);
    this.openPlan.emit({
      scenarioId: v.scenarioId,
      agents: v.agents,
      models,
      startHeading: v.startHeading,
      profile: {
        forwardMs: v.forwardMs, quarterTurnMs: v.quarterTurnMs, waitMs: v.waitMs,
        cellPitchMm: v.cellPitchMm, robotDiameterMm: v.robotDiameterMm, timingJitter: 0,
      },
    });
  }
}

/**
 * The page at /plans/view: one instance under one or two plan models, solved and simulated by
 * the server, replayed on canvases that share one clock, with the figures of each model, a
 * per-robot timeline and the finish times; policy, noise and seed can be changed and re-run
 * here in the browser (solvers/execute) or on the server.
 *
 * Query: `scenario`, `agents`, `model`, optional `compare` (second model), `heading` (start
 * heading) and `profile` (forward,quarterTurn,wait,pitch,diameter); or `execution=ID[,ID]`; or
 * `result=ID[,ID]` with optional `policy`. A stored sweep result opens with exactly the settings
 * its sweep replayed it with (GET /api/executions/stored/:id), so the page shows the stored
 * figures; any other setting is a what-if, labelled with what differs, with a way back.
 * Visitors (and anyone not allowed to run executions) get the same page without the server:
 * the result's plan is read (GET /api/executions/results/:id) and replayed in the browser with
 * the stored settings; the plan downloads as JSON and as text for everyone who may see it.
 */
import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule, NonNullableFormBuilder, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSliderModule } from '@angular/material/slider';
import { Router } from '@angular/router';
import { catchError, firstValueFrom, of } from 'rxjs';
import type { ExecutionSummaryView, ExecutionView, InstanceExecutionInput } from '@shared/executions';
import { hasTextPlan, type ResultPlanView } from '@shared/result-plan-view';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import {
  COLLISION_MODES, EXECUTION_LIMITS, EXECUTION_POLICY_NAMES, SAFETY_NOTE, STARTER_PROFILE,
  type CollisionModeName, type ExecutionPolicyName,
} from '@shared/executions-constants';
import { HEADINGS, PLAN_MODELS, type PlanModel, type RobotProfile, type StartHeading } from '@shared/plan';
import type { MapfInstance } from '@solvers/instance';
import { Session } from '../core/session';
import { ExecutionApi } from './execution-api';
import { ExecutionSummaryCard } from './execution-summary-card';
import { FinishHistogramChart } from './finish-histogram-chart';
import { FleetCanvas } from './fleet-canvas';
import { rerunInBrowser, toMapfInstance, trackOfRun, type RerunSettings } from './fleet-rerun';
import { GanttChart } from './gantt-chart';
import { PlanPicker, type PlanChoice } from './plan-picker';
import { REPLAY_SPEEDS, ReplayClock } from './replay-clock';
import {
  replayablePolicies, settingsDifferences, storedFiguresLine, storedOfPolicy, storedReplayFor, type BatchSettings,
} from './stored-settings';
import { formatSeconds } from './viewer-format';
import { ROBOT_STATE_STYLES } from './viewer-palette';
import { paneWith, type ViewerPane } from './viewer-pane';
import { FieldTrialsPanel } from '../trials/field-trials-panel';

export type { ViewerPane } from './viewer-pane';

/** The plan viewer page. */
@Component({
  selector: 'app-plan-viewer',
  templateUrl: './plan-viewer.html',
  styleUrl: './plan-viewer.scss',
  imports: [
    ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatSliderModule, MatProgressBarModule,
    FleetCanvas, GanttChart, FinishHistogramChart, ExecutionSummaryCard, PlanPicker, FieldTrialsPanel,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class PlanViewer {
  private readonly api = inject(ExecutionApi);
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly fb = inject(NonNullableFormBuilder);
  /** Query: scenario id. */
  readonly scenario = input<string>();
  /** Query: number of agents (first k rows of the scenario). */
  readonly agents = input<string>();
  /** Query: the plan model. */
  readonly model = input<string>();
  /** Query: a second plan model shown side by side. */
  readonly compare = input<string>();
  /** Query: start heading rule (free, N, E, S, W). */
  readonly heading = input<string>();
  /** Query: robot profile as forward,quarterTurn,wait,pitch,diameter. */
  readonly profile = input<string>();
  /** Query: stored execution ids, comma-separated. */
  readonly execution = input<string>();
  /** Query: stored result ids (sweep or submitted plans), comma-separated; two are shown side by side. */
  readonly result = input<string>();
  /** Query: with `result`, which of the policies the sweep stored to open (default open-loop, else the first stored). */
  readonly policy = input<string>();

  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly policies = EXECUTION_POLICY_NAMES;
  protected readonly collisionModes = COLLISION_MODES;
  protected readonly speeds = REPLAY_SPEEDS;
  /** Every robot state with the shape and colour the map draws it in, then the collision mark. */
  protected readonly robotLegend: readonly { readonly label: string; readonly shape: string; readonly colour: string }[] = [
    ...ROBOT_STATE_STYLES.map((s) => ({ label: s.label, shape: s.shape, colour: s.colour })),
    { label: 'Collision (wide ring round the contact point)', shape: 'collision', colour: 'var(--mat-sys-error)' },
  ];
  /** The legend's octagon (12 px box centred on 0). */
  protected readonly octagon = Array.from({ length: 8 }, (_, k) => {
    const a = ((k + 0.5) * Math.PI) / 4;
    return `${(5 * Math.cos(a)).toFixed(2)},${(5 * Math.sin(a)).toFixed(2)}`;
  }).join(' ');
  protected readonly clock = new ReplayClock();
  protected readonly panes = signal<readonly ViewerPane[]>([]);
  protected readonly isBusy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly settings = this.fb.group({
    policy: this.fb.control<ExecutionPolicyName>('open-loop'),
    jitterCv: this.fb.control(0, [Validators.required, Validators.min(0), Validators.max(2)]),
    stallProbability: this.fb.control(0, [Validators.required, Validators.min(0), Validators.max(1)]),
    stallMs: this.fb.control(0, [Validators.required, Validators.min(0), Validators.max(600_000)]),
    seed: this.fb.control(1, [Validators.required, Validators.min(0), Validators.max(0xffffffff)]),
    runs: this.fb.control(20, [Validators.required, Validators.min(1), Validators.max(EXECUTION_LIMITS.maxRuns)]),
    shownRun: this.fb.control(1, [Validators.required, Validators.min(1)]),
    onCollision: this.fb.control<CollisionModeName>('count'),
  });
  protected readonly timeText = computed(() => `${formatSeconds(this.clock.timeMs())} of ${formatSeconds(this.clock.horizonMs())}`);
  protected readonly sourceText = computed(() => {
    const first = this.panes()[0]?.execution;
    if (!first) return '';
    const s = first.source;
    const stored = s.resultId === undefined ? '' : ` · stored result ${s.resultId}${s.sweepId === undefined ? '' : ` of sweep ${s.sweepId}`}`;
    return `${s.scenarioName ?? 'tasks on ' + s.mapName} · map ${s.mapName} (${first.instance.width}×${first.instance.height}) · ${first.instance.agents.length} agents${stored}`;
  });
  protected readonly canvasPx = computed(() => (this.panes().length > 1 ? 440 : 620));
  /** Whether this account may run executions on the server (researchers and up); others replay in the browser. */
  protected readonly canRunOnServer = computed(() => this.session.hasRole('researcher'));
  /** Per pane showing a stored result: where its plan downloads (text only for the models the text format carries). */
  protected readonly downloads = computed(() => this.panes().map((pane) => {
    const id = pane.execution.source.resultId;
    if (id === undefined) return null;
    return { resultId: id, json: this.api.planDownloadUrl(id, 'json'), text: hasTextPlan(pane.execution.model) ? this.api.planDownloadUrl(id, 'txt') : null };
  }));
  /** The policies the sweep stored for the shown result (the first pane's), each openable with its stored settings. */
  protected readonly storedPolicies = computed(() => {
    const stored = this.panes()[0]?.stored;
    return stored ? replayablePolicies(stored).map((e) => e.settings.policy) : [];
  });
  /** The shown policy when it is one of the stored replays with the stored settings, else null. */
  protected readonly shownStoredPolicy = computed(() => {
    const first = this.panes()[0];
    return first && first.stored && first.whatIf.length === 0 && first.stored.executions.length > 0 ? first.summary.policy : null;
  });
  private readonly formValue = toSignal(this.settings.valueChanges, { initialValue: this.settings.getRawValue() });
  /** What re-running with the form's settings would change against the stored settings (a what-if), when it is not what is shown. */
  protected readonly pendingWhatIf = computed(() => {
    this.formValue();
    const first = this.panes()[0];
    if (!first?.stored || first.stored.executions.length === 0 || this.settings.invalid) return [];
    const next = settingsDifferences(first.stored, this.batchSettings(this.rerunSettings()));
    return next.join() === first.whatIf.join() ? [] : next;
  });
  /** The stored figures of a pane's shown policy (or its first stored replay), for the what-if banner. */
  protected storedLine(pane: ViewerPane): string | null {
    if (!pane.stored) return null;
    const replay = storedOfPolicy(pane.stored, pane.summary.policy) ?? storedReplayFor(pane.stored);
    return replay ? storedFiguresLine(replay) : null;
  }

  constructor() {
    inject(DestroyRef).onDestroy(() => this.clock.destroy());
    effect(() => {
      const query = {
        scenario: this.scenario(), agents: this.agents(), model: this.model(), compare: this.compare(),
        heading: this.heading(), profile: this.profile(), execution: this.execution(), result: this.result(), policy: this.policy(),
      };
      untracked(() => void this.openFromQuery(query));
    });
  }

  /** Puts a picked choice into the URL (which opens it). */
  protected openChoice(choice: PlanChoice): void {
    const p = choice.profile;
    void this.router.navigate(['/plans/view'], {
      queryParams: {
        scenario: choice.scenarioId, agents: choice.agents, model: choice.models[0], compare: choice.models[1],
        heading: choice.startHeading, profile: [p.forwardMs, p.quarterTurnMs, p.waitMs, p.cellPitchMm, p.robotDiameterMm].join(','),
      },
    });
  }

  /** Play or pause. */
  protected togglePlay(): void {
    if (this.clock.isPlaying()) this.clock.pause();
    else this.clock.play();
  }

  /** Re-simulates every pane here, with the settings of the form. */
  protected async rerunHere(): Promise<void> {
    if (this.settings.invalid || this.panes().length === 0) return;
    const settings = this.rerunSettings();
    await this.busy(async () => {
      const next: ViewerPane[] = [];
      for (const pane of this.panes()) {
        const result = await rerunInBrowser(pane.instance, pane.execution.plan, pane.execution.profile, settings);
        next.push(paneWith(pane, result.summary, 'browser', result.track, settings.shownRun));
      }
      this.showPanes(next);
    });
  }

  /** Re-simulates every pane on the server (same plans, sent as schedules), with the settings of the form. */
  protected async rerunOnServer(): Promise<void> {
    if (this.settings.invalid || this.panes().length === 0) return;
    const settings = this.rerunSettings();
    await this.busy(async () => {
      const next: ViewerPane[] = [];
      for (const pane of this.panes()) {
        const e = pane.execution;
        // A stored result's plan is replayed by its id, so the new execution keeps naming its source.
        const fresh = await firstValueFrom(this.api.create(e.source.resultId !== undefined ? { resultId: e.source.resultId, ...this.requestSettings(settings) } : {
          instance: e.source.scenarioId !== undefined ? { scenarioId: e.source.scenarioId, agents: e.instance.agents.length } : { mapId: e.source.mapId, agents: [...e.instance.agents] },
          model: e.model,
          modelOptions: e.modelOptions,
          profile: e.profile,
          plan: { kind: 'schedule', schedule: e.plan.schedule },
          ...this.requestSettings(settings),
        }));
        const track = trackOfRun(pane.instance, e.plan, e.profile, settings);
        next.push(paneWith({ ...pane, execution: e }, fresh.summary, 'server', track, settings.shownRun));
      }
      this.showPanes(next);
    });
  }

  /**
   * Shows the stored replay of `policy` (or of the shown policy) for every pane that shows a stored
   * result: re-executes it with exactly the settings its sweep used, so the figures are the stored ones.
   */
  protected async showStored(policy?: string): Promise<void> {
    if (this.panes().length === 0) return;
    const wanted = policy ?? this.panes()[0].summary.policy;
    await this.busy(async () => {
      const next: ViewerPane[] = [];
      for (const pane of this.panes()) {
        const replay = pane.stored ? storedReplayFor(pane.stored, wanted) : null;
        if (!pane.stored || !replay || pane.execution.source.resultId === undefined) {
          next.push(pane);
          continue;
        }
        if (!this.canRunOnServer()) {
          next.push(await this.browserPane(pane.execution, pane.stored, { ...replay.settings, shownRun: pane.shownRun }));
          continue;
        }
        const e = await firstValueFrom(this.api.create({ resultId: pane.execution.source.resultId, ...replay.settings }));
        next.push(this.serverPane(e, pane.stored, pane.shownRun));
      }
      const first = next[0];
      if (first) this.adoptSettings(first.summary);
      this.showPanes(next);
    });
  }

  private async openFromQuery(q: Record<string, string | undefined>): Promise<void> {
    this.problem.set(null);
    const settings = this.rerunSettings();
    await this.busy(async () => {
      let executions: ExecutionView[];
      const storedViews: (StoredResultExecutionsView | null)[] = [];
      if (q['result'] && !(await this.mayRunOnServer())) {
        // Not allowed to run on the server: read each result's plan and replay it here with its stored settings.
        const panes: ViewerPane[] = [];
        for (const resultId of idList(q['result'])) {
          const [stored, plan] = await Promise.all([firstValueFrom(this.api.stored(resultId)), firstValueFrom(this.api.resultPlan(resultId))]);
          const replay = storedReplayFor(stored, q['policy']);
          panes.push(await this.browserPane(plan, stored, replay ? { ...replay.settings, shownRun: settings.shownRun } : settings));
        }
        if (panes[0]) this.adoptSettings(panes[0].summary);
        this.showPanes(panes);
        return;
      } else if (q['result']) {
        // A stored result opens with the settings its sweep replayed it with (same figures as the leaderboard).
        const ids = idList(q['result']);
        executions = [];
        for (const resultId of ids) {
          const stored = await firstValueFrom(this.api.stored(resultId));
          const replay = storedReplayFor(stored, q['policy']);
          executions.push(await firstValueFrom(this.api.create({ resultId, ...(replay ? replay.settings : this.requestSettings(settings)) })));
          storedViews.push(stored);
        }
        if (executions[0]) this.adoptSettings(executions[0].summary);
      } else if (q['execution']) {
        const ids = idList(q['execution']);
        executions = await Promise.all(ids.map((id) => firstValueFrom(this.api.get(id))));
        // A kept replay of a stored result is labelled against that result's stored settings too.
        for (const e of executions) {
          storedViews.push(e.source.resultId === undefined ? null : await firstValueFrom(this.api.stored(e.source.resultId).pipe(catchError(() => of(null)))));
        }
        if (executions[0]) this.adoptSettings(executions[0].summary);
      } else if (q['scenario'] && q['agents'] && q['model']) {
        const models = [q['model'], q['compare']].filter((m): m is PlanModel => m !== undefined && (PLAN_MODELS as readonly string[]).includes(m));
        const unique = [...new Set(models)];
        const heading = (['free', ...HEADINGS] as readonly string[]).includes(q['heading'] ?? '') ? (q['heading'] as StartHeading) : 'free';
        const base = {
          instance: { scenarioId: Number(q['scenario']), agents: Number(q['agents']) },
          modelOptions: { startHeading: heading },
          profile: parseProfile(q['profile']),
          ...this.requestSettings(settings),
        };
        executions = [];
        for (const model of unique) executions.push(await firstValueFrom(this.api.create({ ...base, model })));
      } else {
        this.showPanes([]);
        return;
      }
      this.showPanes(executions.map((e, i) => this.serverPane(e, storedViews[i] ?? null, settings.shownRun)));
    });
  }

  /** A pane of an execution computed on the server, drawing run `shownRun` (clamped to its runs). */
  private serverPane(e: ExecutionView, stored: StoredResultExecutionsView | null, shownRun: number): ViewerPane {
    const instance = toMapfInstance(e.instance);
    const shown = Math.max(0, Math.min(shownRun, e.summary.runs - 1));
    const track = trackOfRun(instance, e.plan, e.profile, { ...this.rerunSettingsFrom(e.summary), shownRun: shown });
    return paneWith({ execution: e, instance, stored }, e.summary, 'server', track, shown);
  }

  /** A pane of a plan replayed here in the browser, drawing run `settings.shownRun` (clamped to its runs). */
  private async browserPane(plan: ResultPlanView, stored: StoredResultExecutionsView | null, settings: RerunSettings): Promise<ViewerPane> {
    const instance = toMapfInstance(plan.instance);
    const shown = Math.max(0, Math.min(settings.shownRun, settings.runs - 1));
    const result = await rerunInBrowser(instance, plan.plan, plan.profile, { ...settings, shownRun: shown });
    return paneWith({ execution: plan, instance, stored }, result.summary, 'browser', result.track, shown);
  }

  /** Whether the account may run executions on the server, once the session is known. */
  private async mayRunOnServer(): Promise<boolean> {
    await this.session.load();
    return this.canRunOnServer();
  }

  /** The batch settings of a re-run (what a stored replay's settings are compared with). */
  private batchSettings(s: RerunSettings): BatchSettings {
    return {
      policy: s.policy, runs: s.runs, seed: s.seed, onCollision: s.onCollision,
      noise: { jitterCv: s.noise.jitterCv ?? 0, stallProbability: s.noise.stallProbability ?? 0, stallMs: s.noise.stallMs ?? 0 },
    };
  }

  private showPanes(panes: readonly ViewerPane[]): void {
    this.panes.set(panes);
    const horizon = Math.max(0, ...panes.map((p) => p.track?.horizonMs ?? 0));
    this.clock.setHorizon(horizon);
    this.clock.redraw();
  }

  private async busy(work: () => Promise<void>): Promise<void> {
    this.isBusy.set(true);
    try {
      await work();
    } catch (err) {
      // HTTP errors have been shown by the error interceptor; simulator refusals are shown here.
      if (err instanceof Error) this.problem.set(err.message);
    } finally {
      this.isBusy.set(false);
    }
  }

  private rerunSettings(): RerunSettings {
    const v = this.settings.getRawValue();
    return {
      policy: v.policy,
      noise: { jitterCv: v.jitterCv, stallProbability: v.stallProbability, stallMs: v.stallMs },
      seed: v.seed,
      runs: v.runs,
      onCollision: v.onCollision,
      shownRun: Math.max(0, Math.min(v.shownRun, v.runs) - 1),
    };
  }

  private rerunSettingsFrom(s: ExecutionSummaryView): RerunSettings {
    return { policy: s.policy, noise: s.noise, seed: s.seed, runs: s.runs, onCollision: s.onCollision, shownRun: 0 };
  }

  private requestSettings(s: RerunSettings): Pick<InstanceExecutionInput, 'policy' | 'noise' | 'seed' | 'runs' | 'onCollision'> {
    return {
      policy: s.policy,
      noise: { jitterCv: s.noise.jitterCv, stallProbability: s.noise.stallProbability ?? 0, stallMs: s.noise.stallMs ?? 0 },
      seed: s.seed, runs: s.runs, onCollision: s.onCollision,
    };
  }

  private adoptSettings(s: ExecutionSummaryView): void {
    this.settings.patchValue({
      policy: s.policy, jitterCv: s.noise.jitterCv, stallProbability: s.noise.stallProbability, stallMs: s.noise.stallMs,
      seed: s.seed, runs: s.runs, onCollision: s.onCollision,
    });
  }
}

/** The profile from `forward,quarterTurn,wait,pitch,diameter`, or the starter profile (no jitter: noise is set separately). */
function parseProfile(text: string | undefined): RobotProfile {
  const base = { ...STARTER_PROFILE, timingJitter: 0 };
  if (!text) return base;
  const [forwardMs, quarterTurnMs, waitMs, cellPitchMm, robotDiameterMm] = text.split(',').map(Number);
  const ok = [forwardMs, quarterTurnMs, waitMs, cellPitchMm, robotDiameterMm].every((v) => Number.isFinite(v) && v > 0);
  return ok ? { ...base, forwardMs, quarterTurnMs, waitMs, cellPitchMm, robotDiameterMm } : base;
}

/** Up to two positive ids from a comma-separated query value. */
function idList(value: string): number[] {
  return value.split(',').map(Number).filter((n) => Number.isInteger(n) && n > 0).slice(0, 2);
}

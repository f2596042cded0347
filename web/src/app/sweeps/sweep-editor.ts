/**
 * The page at /sweeps/new: a typed reactive form for a sweep definition, with a live count of
 * the runs it expands to (computed by the same shared `sweepSize` the server uses to refuse
 * absurd sizes), then launch and go to the sweep's live page. Beside the fields it says what they
 * imply: the following hazard of the robot profile, the precision the Monte Carlo run count gives,
 * and which models use the wait time (sweep-editor-advice.ts).
 */
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { catchError, distinctUntilChanged, map, of, startWith, switchMap } from 'rxjs';
import type { InstanceSetDetail } from '@shared/instance-sets';
import { CBS_SWITCH_TEXT, cbsSwitchLabel, checkSweepSize, sweepSize } from '@shared/sweeps';
import { InstanceSetApi } from '../instance-sets/instance-set-api';
import { ExternalSolverApi } from './external-solver-api';
import { SweepApi } from './sweep-api';
import { currentPrecisionText, FOLLOWING_EXPLANATION, followingWarning, HALF_WIDTH_CHOICES, percentText, runsNeededText, WAIT_RULE } from './sweep-editor-advice';
import {
  definitionFromForm, externalChoices, FORM_MODELS, FORM_POLICIES, FORM_SWITCHES, SUBOPTIMALITY_HINT, SWEEP_FORM_DEFAULTS, takesFollowingRule, type SweepFormValue,
} from './sweep-form-rules';
import { MiddleEllipsisPipe } from '../core/middle-ellipsis.pipe';
import { TrialsApi } from '../trials/trials-api';

/** The sweep form. */
@Component({
  selector: 'app-sweep-editor',
  templateUrl: './sweep-editor.html',
  styleUrl: './sweep-editor.scss',
  imports: [MiddleEllipsisPipe, RouterLink, ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatCheckboxModule, MatButtonModule, MatButtonToggleModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class SweepEditor {
  private readonly api = inject(SweepApi);
  private readonly sets = inject(InstanceSetApi);
  private readonly router = inject(Router);
  /** Named robot profiles fitted from field runs (issue 17): presets that fill the profile fields and the stalls. */
  protected readonly namedProfiles = toSignal(inject(TrialsApi).profiles().pipe(catchError(() => of([]))), { initialValue: [] });
  protected readonly models = FORM_MODELS;
  /** Registered external solvers, one choice per solver and plan model (issue 16, item 4). */
  protected readonly externalChoices = toSignal(inject(ExternalSolverApi).list().pipe(map((r) => externalChoices(r.items)), catchError(() => of([]))), { initialValue: [] });
  protected readonly switches = FORM_SWITCHES;
  /** Label and explanation of each CBS switch (shared/sweeps.ts); the identifiers stay the form values. */
  protected readonly switchText = CBS_SWITCH_TEXT;
  protected readonly policies = FORM_POLICIES;
  protected readonly form = inject(NonNullableFormBuilder).group({
    ...Object.fromEntries(Object.entries(SWEEP_FORM_DEFAULTS).map(([k, v]) => [k, [v]])),
  } as { [K in keyof SweepFormValue]: [SweepFormValue[K]] });
  /** The sets the viewer may see (first 100). */
  protected readonly setChoices = toSignal(this.sets.list({ q: '', page: 1, pageSize: 100 }).pipe(map((r) => r.items), catchError(() => of([]))), { initialValue: [] });
  protected readonly value = toSignal(this.form.valueChanges.pipe(map(() => this.form.getRawValue()), startWith(this.form.getRawValue())), { requireSync: true });
  /** The chosen set with its scenarios (null while none is chosen or loading). */
  protected readonly chosenSet = toSignal(this.form.controls.instanceSetId.valueChanges.pipe(
    startWith(this.form.controls.instanceSetId.value),
    distinctUntilChanged(),
    switchMap((id) => (id === null ? of(null) : this.sets.get(id).pipe(startWith(null), catchError(() => of(null))))),
  ), { initialValue: null as InstanceSetDetail | null });
  /** The definition or the form's first problem. */
  protected readonly built = computed(() => definitionFromForm(this.value()));
  /** What the closed switch picker shows: the labels of the switches turned off. */
  protected readonly switchesOffText = computed(() => this.value().switchesOff.map(cbsSwitchLabel).join(', '));
  /** Size and refusal, from the shared rule. */
  protected readonly size = computed(() => {
    const b = this.built();
    const set = this.chosenSet();
    if (!('definition' in b) || !set) return null;
    const size = sweepSize(b.definition, set.scenarios.map((s) => ({ id: s.id, maxAgents: s.maxAgents })));
    return { ...size, refusal: checkSweepSize(size) };
  });
  protected readonly followingExplanation = FOLLOWING_EXPLANATION;
  protected readonly suboptimalityHint = SUBOPTIMALITY_HINT;
  protected readonly waitRule = WAIT_RULE;
  protected readonly halfWidthChoices = HALF_WIDTH_CHOICES.map((h) => ({ value: h, label: percentText(h) }));
  /** Whether a chosen model takes the following rule (else the choice is hidden). */
  protected readonly takesFollowing = computed(() => this.value().models.some(takesFollowingRule));
  /** The profile's following hazard, when a chosen model's plans may follow. */
  protected readonly followingWarning = computed(() => followingWarning(this.value()));
  /** What the current Monte Carlo run count gives. */
  protected readonly precision = computed(() => currentPrecisionText(this.value().monteCarloRuns));
  /** The interval half-width the user wants runs for. */
  protected readonly wantedHalfWidth = signal<number>(0.05);
  protected readonly runsNeeded = computed(() => runsNeededText(this.wantedHalfWidth()));
  /** Whether a launch request is on its way. */
  protected readonly isLaunching = signal(false);
  /** Whether the form may be launched. */
  protected readonly canLaunch = computed(() => !this.isLaunching() && this.size() !== null && this.size()?.refusal === null);

  constructor() {
    // A new set means new scenarios: the previous choice no longer applies.
    this.form.controls.instanceSetId.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.form.controls.scenarioIds.setValue([]));
  }

  /** Fills the profile fields (and the stalls the fit found) from named profile `id`. */
  protected useNamedProfile(id: number): void {
    const named = this.namedProfiles().find((p) => p.id === id);
    if (!named) return;
    const { forwardMs, quarterTurnMs, waitMs, cellPitchMm, robotDiameterMm, timingJitter } = named.profile;
    this.form.patchValue({
      forwardMs, quarterTurnMs, waitMs, cellPitchMm, robotDiameterMm, timingJitter,
      stallProbability: named.provenance.stallProbability, stallMs: named.provenance.stallMs,
    });
  }

  /** Sets the Monte Carlo runs to what the wanted interval width needs. */
  protected useRunsNeeded(): void {
    const needed = this.runsNeeded();
    if (needed.isAllowed) this.form.controls.monteCarloRuns.setValue(needed.runs);
  }

  /** Sends the definition and opens the sweep's page. */
  protected launchSweep(): void {
    const b = this.built();
    if (!('input' in b)) return;
    this.isLaunching.set(true);
    this.api.launch(b.input).subscribe({
      next: (sweep) => void this.router.navigate(['/sweeps', sweep.id]),
      error: () => this.isLaunching.set(false),
    });
  }
}

/**
 * Fitting a robot profile to a result's field runs and saving it under a name (issue 17, item 4):
 * the fitted values with their 95 % intervals, a goodness-of-fit plot (normal QQ plot of the
 * standardised log durations, with the Kolmogorov–Smirnov distance) and a form to save the
 * profile, which the sweep editor then offers.
 */
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { firstValueFrom } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import type { TrialCalibrationView } from '@shared/field-trials';
import { errorMessage } from '../core/error-message';
import { TrialsApi } from './trials-api';

const QQ = 200;

/** One row of the fitted-values table. */
interface FitRow {
  readonly label: string;
  readonly value: string;
  readonly interval: string;
}

/** The fitted values as table rows (ms for times, plain numbers for jitter and probability). */
export function fitRows(view: TrialCalibrationView): FitRow[] {
  const f = view.fit;
  const ms = (v: number | null) => (v === null ? '–' : `${v.toFixed(0)} ms`);
  const num = (v: number | null, digits: number) => (v === null ? '–' : v.toFixed(digits));
  const ci = (c: readonly [number, number] | null, fmt: (v: number) => string) => (c === null ? 'not fitted' : `${fmt(c[0])} – ${fmt(c[1])}`);
  return [
    { label: `Forward time (${f.actions.forward} actions)`, value: ms(f.forwardMs), interval: ci(f.ci95.forwardMs, ms) },
    { label: `Quarter-turn time (${f.actions.turn} actions)`, value: ms(f.quarterTurnMs), interval: ci(f.ci95.quarterTurnMs, ms) },
    { label: `Wait time (${f.actions.wait} actions)`, value: ms(f.waitMs), interval: ci(f.ci95.waitMs, ms) },
    { label: 'Timing jitter (CV)', value: num(f.timingJitter, 3), interval: ci(f.ci95.timingJitter, (v) => v.toFixed(3)) },
    { label: 'Stall probability', value: num(f.stallProbability, 3), interval: ci(f.ci95.stallProbability, (v) => v.toFixed(3)) },
    { label: 'Stall length', value: f.stallProbability > 0 ? ms(f.stallMs) : '–', interval: ci(f.ci95.stallMs, ms) },
  ];
}

@Component({
  selector: 'app-profile-fit',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <section class="fit" aria-labelledby="profile-fit-title" data-testid="profile-fit">
      <h3 id="profile-fit-title">Fit a robot profile to these runs</h3>
      <p class="hint">Fits forward, quarter-turn and wait times, timing jitter and stalls to the logged durations of all {{ runCount() }} runs (maximum likelihood; see Help, "Calibrating a robot profile").</p>
      <button mat-stroked-button type="button" (click)="fit()" [disabled]="isBusy()" data-testid="fit-profile">Fit profile</button>
      @if (problem(); as p) { <p class="problem" role="alert">{{ p }}</p> }
      @if (view(); as v) {
        <table class="values" data-testid="fit-values">
          <caption>Fitted values with 95 % intervals</caption>
          <thead><tr><th scope="col">Quantity</th><th scope="col">Fitted</th><th scope="col">95 % interval</th></tr></thead>
          <tbody>@for (r of rows(); track r.label) { <tr><th scope="row">{{ r.label }}</th><td>{{ r.value }}</td><td>{{ r.interval }}</td></tr> }</tbody>
        </table>
        <figure>
          <figcaption>Goodness of fit: standardised log durations against normal quantiles (Kolmogorov–Smirnov distance {{ v.fit.goodnessOfFit.ksDistance.toFixed(3) }})</figcaption>
          <svg [attr.viewBox]="'0 0 ' + (size + 30) + ' ' + (size + 24)" role="img" [attr.aria-label]="'Normal QQ plot of ' + v.fit.goodnessOfFit.qq.length + ' points; Kolmogorov–Smirnov distance ' + v.fit.goodnessOfFit.ksDistance.toFixed(3)">
            <g transform="translate(26,4)">
              <rect x="0" y="0" [attr.width]="size" [attr.height]="size" class="frame" />
              <line [attr.x1]="0" [attr.y1]="size" [attr.x2]="size" [attr.y2]="0" class="diagonal" />
              @for (p of points(); track $index) { <circle [attr.cx]="p.x" [attr.cy]="p.y" r="2" class="dot" /> }
              <text [attr.x]="size / 2" [attr.y]="size + 16" class="axis">normal quantile (−{{ span }} … {{ span }})</text>
              <text x="-16" [attr.y]="size / 2" class="axis" [attr.transform]="'rotate(-90 -16 ' + size / 2 + ')'">observed</text>
            </g>
          </svg>
          <p class="hint">Points on the diagonal: the log-normal durations the simulator draws describe the logs; a bend in the upper tail means longer holds than the fit allows.</p>
        </figure>
        <p class="hint">The profile keeps the result's cell pitch ({{ v.profile.cellPitchMm }} mm) and robot diameter ({{ v.profile.robotDiameterMm }} mm).
          @if (v.provenance.stallProbability > 0) { Stalls are no profile field: give a sweep stall probability {{ v.provenance.stallProbability.toFixed(3) }} and stall length {{ v.provenance.stallMs }} ms. }
        </p>
        <form class="save" (ngSubmit)="save()" aria-label="Save the fitted profile">
          <mat-form-field><mat-label>Profile name</mat-label><input matInput [(ngModel)]="name" name="name" maxlength="100" data-testid="profile-name" /></mat-form-field>
          <button mat-flat-button type="submit" [disabled]="isBusy() || name.trim() === ''" data-testid="save-profile">Save profile</button>
        </form>
        @if (saved(); as s) { <p class="saved" role="status" data-testid="profile-saved">{{ s }}</p> }
      }
    </section>`,
  styles: [`
    :host { display: block; margin-top: 16px; }
    h3 { font: var(--mat-sys-title-small); margin: 14px 0 6px; }
    .hint { font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); margin: 4px 0; }
    table.values { border-collapse: collapse; font: var(--mat-sys-body-small); margin: 8px 0; }
    table.values caption { text-align: left; font: var(--mat-sys-label-large); padding-bottom: 4px; }
    table.values th, table.values td { padding: 3px 8px; border-bottom: 1px solid var(--mat-sys-outline-variant); text-align: left; }
    figure { margin: 8px 0; max-width: 300px; }
    figcaption { font: var(--mat-sys-label-large); }
    svg { width: 100%; height: auto; }
    .frame { fill: none; stroke: var(--mat-sys-outline-variant); }
    .diagonal { stroke: var(--mat-sys-secondary); stroke-dasharray: 4 3; }
    .dot { fill: var(--mat-sys-primary); }
    .axis { font: 10px 'Fira Sans', system-ui, sans-serif; text-anchor: middle; fill: var(--mat-sys-on-surface-variant); }
    .save { display: flex; gap: 8px; align-items: baseline; flex-wrap: wrap; }
    .problem { color: var(--mat-sys-error); }
  `],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProfileFit {
  private readonly api = inject(TrialsApi);
  readonly resultId = input.required<number>();
  readonly runCount = input.required<number>();

  protected readonly view = signal<TrialCalibrationView | null>(null);
  protected readonly isBusy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly saved = signal<string | null>(null);
  protected name = '';
  protected readonly size = QQ;
  /** Half-width of the plotted quantile range. */
  protected readonly span = 3;
  protected readonly rows = computed(() => {
    const v = this.view();
    return v ? fitRows(v) : [];
  });
  protected readonly points = computed(() => {
    const v = this.view();
    if (!v) return [];
    const at = (z: number) => (Math.max(-this.span, Math.min(this.span, z)) + this.span) / (2 * this.span) * QQ;
    return v.fit.goodnessOfFit.qq.map((p) => ({ x: at(p.theoretical), y: QQ - at(p.observed) }));
  });

  protected async fit(): Promise<void> {
    await this.busy(async () => {
      this.view.set(await firstValueFrom(this.api.calibrate(this.resultId())));
      this.saved.set(null);
    });
  }

  protected async save(): Promise<void> {
    const v = this.view();
    if (!v) return;
    await this.busy(async () => {
      const saved = await firstValueFrom(this.api.saveProfile(this.name.trim(), this.resultId(), v.provenance.runs.map((r) => r.id)));
      this.saved.set(`Saved as "${saved.name}" (from ${saved.provenance.runs.length} runs of result ${saved.provenance.resultId}). The sweep editor offers it under "Named profile".`);
    });
  }

  private async busy(work: () => Promise<void>): Promise<void> {
    this.isBusy.set(true);
    this.problem.set(null);
    try {
      await work();
    } catch (err) {
      this.problem.set(errorMessage(err));
    } finally {
      this.isBusy.set(false);
    }
  }
}

/**
 * The page at /sweeps/solvers (issue 16, item 4): the registered external solvers with their plan
 * models, command and the workers that declared them lately; maintainers register one (name,
 * version, plan models, command template, plan format) and remove one after a confirmation.
 * The form checks the template with the shared rule the server applies, so its problems show
 * while typing.
 */
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { firstValueFrom, map, startWith } from 'rxjs';
import { EXAMPLE_SOLVER, ExternalSolverRequestSchema, PLACEHOLDERS, REQUIRED_PLACEHOLDERS, type ExternalSolverView } from '@shared/external-solvers';
import { PLAN_MODELS, type PlanModel } from '@shared/plan';
import { askToConfirm } from '../core/confirm-dialog';
import { Session } from '../core/session';
import { ExternalSolverApi } from './external-solver-api';

/** The form's first problem as a sentence, or null when the registration is acceptable. */
export function registrationProblem(value: unknown): string | null {
  const parsed = ExternalSolverRequestSchema.safeParse(value);
  if (parsed.success) return null;
  const issue = parsed.error.issues[0];
  return `${issue.path.join('.') || 'form'}: ${issue.message}`;
}

/** The external solvers page. */
@Component({
  selector: 'app-external-solvers-page',
  template: `
    <p class="crumbs"><a routerLink="/sweeps">Sweeps</a></p>
    <h1>External solvers</h1>
    <p class="lead">Programs outside Quarterturn that compute plans in sweeps. A worker runs one only when its
      <code>WORKER_SOLVERS</code> setting names it with the hash of the command its operator approved
      (<code>name&#64;version=sha256:&lt;hash&gt;</code>, the hash shown below); each run is a child process under the run's time and memory limits, and its plan goes
      through the plan model's validator and the execution replays like a built-in result.</p>

    @if (solvers(); as list) {
      @if (list.length === 0) {
        <p class="empty">No external solver is registered.</p>
      } @else {
        <ul class="solvers" aria-label="Registered external solvers">
          @for (x of list; track x.id) {
            <li class="solver" [attr.data-solver]="x.name + '@' + x.version">
              <div class="title">
                <h2>{{ x.name }} <span class="version">{{ x.version }}</span></h2>
                @if (canRegister()) {
                  <button mat-stroked-button type="button" (click)="remove(x)" [attr.aria-label]="'Remove ' + x.name + ' ' + x.version">Remove</button>
                }
              </div>
              @if (x.description) { <p>{{ x.description }}</p> }
              <dl>
                <dt>Plan models</dt><dd>{{ x.models.join(', ') }} ({{ x.planFormat === 'json' ? 'JSON plan document' : 'text plan' }})</dd>
                <dt>Command</dt><dd><code>{{ x.command }}</code></dd>
                <dt>Command hash</dt><dd><code class="hash" data-testid="command-hash">sha256:{{ x.commandSha256 }}</code></dd>
                <dt>Workers</dt>
                <dd data-testid="solver-workers">@if (x.workers.length > 0) { {{ x.workers.join(', ') }} } @else {
                  <span class="warn">No worker has declared it lately: its runs wait until one does.</span> }</dd>
                <dt>Registered</dt><dd>{{ x.createdAt | date: 'medium' }}@if (x.registeredBy) { by {{ x.registeredBy.login }} }</dd>
              </dl>
            </li>
          }
        </ul>
      }
    } @else if (hasFailed()) {
      <p class="empty">The external solvers could not be loaded.</p>
    }

    @if (canRegister()) {
      <form [formGroup]="form" (ngSubmit)="register()" class="register" aria-labelledby="register-title">
        <h2 id="register-title">Register a solver</h2>
        <div class="row">
          <mat-form-field><mat-label>Name</mat-label><input matInput formControlName="name" required maxlength="24" /><mat-hint>e.g. {{ example.name }}</mat-hint></mat-form-field>
          <mat-form-field><mat-label>Version</mat-label><input matInput formControlName="version" required maxlength="16" /><mat-hint>e.g. {{ example.version }}</mat-hint></mat-form-field>
        </div>
        <mat-form-field>
          <mat-label>Plan models it solves</mat-label>
          <mat-select formControlName="models" multiple>
            @for (m of planModels; track m) { <mat-option [value]="m">{{ m }}</mat-option> }
          </mat-select>
        </mat-form-field>
        <mat-button-toggle-group formControlName="planFormat" aria-label="Plan file format the solver writes">
          <mat-button-toggle value="text">Text plan</mat-button-toggle>
          <mat-button-toggle value="json">JSON plan document</mat-button-toggle>
        </mat-button-toggle-group>
        <mat-form-field class="command" subscriptSizing="dynamic">
          <mat-label>Command</mat-label>
          <textarea matInput formControlName="command" rows="3" required></textarea>
          <mat-hint>{{ commandHint }}</mat-hint>
        </mat-form-field>
        <details class="placeholders">
          <summary>Placeholders</summary>
          <dl>@for (p of placeholders; track p[0]) { <dt><code>{{ '{' + p[0] + '}' }}</code></dt><dd>{{ p[1] }}</dd> }</dl>
        </details>
        <mat-form-field class="command"><mat-label>Description</mat-label><textarea matInput formControlName="description" rows="2" maxlength="2000"></textarea></mat-form-field>
        <p class="problem" aria-live="polite" data-testid="solver-problem">{{ shownProblem() ?? '' }}</p>
        <button mat-flat-button type="submit" [disabled]="problem() !== null || isSaving()">Register</button>
      </form>
    }
  `,
  styles: `
    .lead, .empty { color: var(--mat-sys-on-surface-variant); max-width: 72ch; }
    .solvers { list-style: none; padding: 0; display: grid; gap: 12px; }
    .solver { border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; padding: 12px 16px; }
    .title { display: flex; align-items: center; justify-content: space-between; gap: 12px; }
    .title h2 { margin: 0; font: var(--mat-sys-title-medium); }
    .version { color: var(--mat-sys-on-surface-variant); }
    dl { display: grid; grid-template-columns: max-content 1fr; gap: 4px 12px; margin: 8px 0 0; }
    dt { font-weight: 500; }
    dd { margin: 0; overflow-wrap: anywhere; }
    .warn { color: var(--mat-sys-error); }
    .register { display: flex; flex-direction: column; gap: 8px; max-width: 760px; margin-top: 24px; }
    .row { display: flex; gap: 12px; flex-wrap: wrap; }
    .command { width: 100%; }
    .hash { overflow-wrap: anywhere; }
    .problem { color: var(--mat-sys-error); min-height: 1.5em; margin: 0; }
  `,
  imports: [DatePipe, RouterLink, ReactiveFormsModule, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ExternalSolversPage {
  private readonly api = inject(ExternalSolverApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);
  protected readonly planModels = PLAN_MODELS;
  protected readonly example = EXAMPLE_SOLVER;
  protected readonly placeholders = Object.entries(PLACEHOLDERS);
  protected readonly commandHint = `Words separated by spaces, run without a shell from the worker's Quarterturn folder; it needs ${REQUIRED_PLACEHOLDERS.map((p) => `{${p}}`).join(', ')}.`;
  /** undefined while loading. */
  protected readonly solvers = signal<readonly ExternalSolverView[] | undefined>(undefined);
  protected readonly hasFailed = signal(false);
  protected readonly isSaving = signal(false);
  /** Registering and removing are for maintainers (the server says so too). */
  protected readonly canRegister = computed(() => this.session.hasRole('maintainer'));
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: [''], version: [''], models: [['classic'] as PlanModel[]], planFormat: ['text' as 'text' | 'json'], command: [''], description: [''],
  });
  private readonly value = toSignal(this.form.valueChanges.pipe(map(() => this.form.getRawValue()), startWith(this.form.getRawValue())), { requireSync: true });
  protected readonly problem = computed(() => registrationProblem(this.value()));
  /** Whether the person has changed the form since it was shown or last cleared (no refusal before the first keystroke). */
  private readonly isEdited = toSignal(this.form.valueChanges.pipe(map(() => this.form.dirty), startWith(false)), { requireSync: true });
  /** The refusal, once there is something of the person's to refuse; the Register button stays disabled either way. */
  protected readonly shownProblem = computed(() => (this.isEdited() ? this.problem() : null));

  constructor() {
    this.load();
  }

  private load(): void {
    this.api.list().subscribe({ next: (r) => this.solvers.set(r.items), error: () => this.hasFailed.set(true) });
  }

  /** Sends the registration; on success lists it and clears the form. */
  protected async register(): Promise<void> {
    if (this.problem() !== null || this.isSaving()) return;
    this.isSaving.set(true);
    try {
      const made = await firstValueFrom(this.api.register(this.form.getRawValue()));
      this.solvers.update((list) => [...(list ?? []), made].sort((a, b) => a.name.localeCompare(b.name) || a.version.localeCompare(b.version)));
      this.form.reset();
      this.snackBar.open(`Registered ${made.name} ${made.version}.`, 'OK', { duration: 6000, politeness: 'polite' });
    } catch {
      // The error interceptor shows the server's reason.
    } finally {
      this.isSaving.set(false);
    }
  }

  /** Removes `x` after a confirmation (the server refuses while live sweeps wait for it). */
  protected async remove(x: ExternalSolverView): Promise<void> {
    const isConfirmed = await firstValueFrom(askToConfirm(this.dialog, {
      title: `Remove ${x.name} ${x.version}?`,
      consequences: ['New sweeps can no longer name it. Results it computed stay on the board. Workers that declare it take no more of its runs.'],
      act: 'Remove solver', keep: 'Keep it', isDestructive: true,
    }));
    if (!isConfirmed) return;
    try {
      await firstValueFrom(this.api.remove(x.id));
      this.solvers.update((list) => list?.filter((s) => s.id !== x.id));
      this.snackBar.open(`Removed ${x.name} ${x.version}.`, 'OK', { duration: 6000, politeness: 'polite' });
    } catch {
      // Reported by the error interceptor.
    }
  }
}

/** The form that runs a map generator (and the scenario generator) on the server into this set. */
import { ChangeDetectionStrategy, Component, DestroyRef, inject, input, output, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators, type FormControl, type FormRecord } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { MAP_GENERATOR_KINDS, type GenerateInstancesRequest, type MapGeneratorSpec, type UploadResponse } from '@shared/instance-sets';
import { errorMessage } from '../core/error-message';
import { GENERATOR_FIELDS, GENERATOR_NAMES, type GeneratorField, type GeneratorKind } from './generator-fields';
import { InstanceSetApi } from './instance-set-api';

/** Generator form of one set. */
@Component({
  selector: 'app-generator-form',
  templateUrl: './generator-form.html',
  styles: `
    .grid { display: grid; grid-template-columns: repeat(auto-fill, minmax(11rem, 1fr)); gap: 0 0.75rem; }
    .actions { display: flex; align-items: center; gap: 1rem; }
    .error { color: var(--mat-sys-error); }
  `,
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GeneratorForm {
  private readonly api = inject(InstanceSetApi);
  private readonly fb = inject(NonNullableFormBuilder);
  /** The set to generate into. */
  readonly instanceSetId = input.required<number>();
  /** Emits what was stored. */
  readonly generated = output<UploadResponse>();
  protected readonly kinds = MAP_GENERATOR_KINDS;
  protected readonly kindNames = GENERATOR_NAMES;
  /** The chosen generator's parameters, rebuilt when the kind changes. */
  private readonly params: FormRecord<FormControl<number>> = this.fb.record<number>({});
  protected readonly form = this.fb.group({
    kind: this.fb.control<GeneratorKind>('warehouse'),
    name: this.fb.control('', [Validators.pattern(/^([A-Za-z0-9][A-Za-z0-9._-]{0,120})?$/)]),
    seed: this.fb.control(1, [Validators.required, Validators.min(0), Validators.max(0xffffffff)]),
    scenarioCount: this.fb.control(1, [Validators.required, Validators.min(0), Validators.max(10)]),
    scenarioMode: this.fb.control<'even' | 'random'>('random'),
    rowCount: this.fb.control(50, [Validators.required, Validators.min(1), Validators.max(1000)]),
    rowsPerBucket: this.fb.control(10, [Validators.required, Validators.min(1), Validators.max(100)]),
    params: this.params,
  });
  /** The parameter fields of the chosen kind. */
  protected readonly fields = signal<readonly GeneratorField[]>([]);
  protected readonly isRunning = signal(false);
  protected readonly failure = signal<string | null>(null);

  constructor() {
    this.useKind(this.form.controls.kind.value);
    this.form.controls.kind.valueChanges.pipe(takeUntilDestroyed(inject(DestroyRef))).subscribe((k) => this.useKind(k));
  }

  /** The control of a parameter (typed access for the template). */
  protected param(key: string): FormControl<number> {
    return this.params.controls[key];
  }

  /** Sends the request; on success the parent reloads the set. */
  protected async runGenerator(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    const body: GenerateInstancesRequest = {
      instanceSetId: this.instanceSetId(),
      map: { kind: v.kind, ...v.params } as MapGeneratorSpec,
      seed: v.seed,
      scenarioCount: v.scenarioCount,
      scenarioMode: v.scenarioMode,
      rowCount: v.rowCount,
      rowsPerBucket: v.rowsPerBucket,
      ...(v.name.trim() ? { name: v.name.trim() } : {}),
    };
    this.isRunning.set(true);
    this.failure.set(null);
    try {
      this.generated.emit(await firstValueFrom(this.api.generate(body)));
    } catch (err) {
      this.failure.set(errorMessage(err));
    } finally {
      this.isRunning.set(false);
    }
  }

  private useKind(kind: GeneratorKind): void {
    const params = this.params;
    for (const key of Object.keys(params.controls)) params.removeControl(key);
    for (const field of GENERATOR_FIELDS[kind]) {
      params.addControl(field.key, this.fb.control(field.value, [Validators.required, Validators.min(field.min), Validators.max(field.max)]));
    }
    this.fields.set(GENERATOR_FIELDS[kind]);
  }
}

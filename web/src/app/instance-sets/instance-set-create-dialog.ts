/** Dialog that creates an instance set and closes with the new set. */
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { firstValueFrom } from 'rxjs';
import type { InstanceSetDetail, Visibility } from '@shared/instance-sets';
import { InstanceSetApi } from './instance-set-api';
import { SET_DESCRIPTION_RULES, SET_NAME_RULES, SET_SOURCE_RULES } from './instance-set-form-rules';

/** The create-set dialog; `MatDialogRef.afterClosed()` gives the created set, or undefined. */
@Component({
  selector: 'app-instance-set-create-dialog',
  templateUrl: './instance-set-create-dialog.html',
  styles: '.fields { display: grid; gap: 0.25rem; min-width: min(32rem, 80vw); } .hint { font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }',
  imports: [ReactiveFormsModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatRadioModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstanceSetCreateDialog {
  private readonly api = inject(InstanceSetApi);
  private readonly dialogRef = inject<MatDialogRef<InstanceSetCreateDialog, InstanceSetDetail>>(MatDialogRef);
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', SET_NAME_RULES],
    description: ['', SET_DESCRIPTION_RULES],
    visibility: ['private' as Visibility],
    source: ['', SET_SOURCE_RULES],
  });
  /** Whether the create request is on its way. */
  protected readonly isSaving = signal(false);

  /** Sends the form; the error interceptor reports a refusal (e.g. a name already used). */
  protected async createSet(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.isSaving.set(true);
    try {
      this.dialogRef.close(await firstValueFrom(this.api.create(this.form.getRawValue())));
    } catch {
      this.isSaving.set(false);
    }
  }
}

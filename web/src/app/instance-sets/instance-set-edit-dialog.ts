/**
 * Dialog that changes an instance set's name, description, source and visibility, and closes with
 * the changed set. Only the fields that differ are sent; a refusal that names a field (a name the
 * owner already uses: 409) shows under that field.
 */
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { firstValueFrom } from 'rxjs';
import type { InstanceSetDetail, UpdateInstanceSetRequest, Visibility } from '@shared/instance-sets';
import { fieldRefusalOf } from './field-refusal';
import { InstanceSetApi } from './instance-set-api';
import { SET_DESCRIPTION_RULES, SET_NAME_RULES, SET_SOURCE_RULES } from './instance-set-form-rules';

const FIELDS = ['name', 'description', 'source', 'visibility'] as const;

/** The edit dialog; `MatDialogRef.afterClosed()` gives the changed set, or undefined. */
@Component({
  selector: 'app-instance-set-edit-dialog',
  templateUrl: './instance-set-edit-dialog.html',
  styles: '.fields { display: grid; gap: 0.25rem; min-width: min(32rem, 80vw); } .refusal { color: var(--mat-sys-error); } .hint { font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }',
  imports: [ReactiveFormsModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatRadioModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstanceSetEditDialog {
  private readonly api = inject(InstanceSetApi);
  private readonly dialogRef = inject<MatDialogRef<InstanceSetEditDialog, InstanceSetDetail>>(MatDialogRef);
  protected readonly set = inject<InstanceSetDetail>(MAT_DIALOG_DATA);
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: [this.set.name, SET_NAME_RULES],
    description: [this.set.description, SET_DESCRIPTION_RULES],
    visibility: [this.set.visibility as Visibility],
    source: [this.set.source, SET_SOURCE_RULES],
  });
  protected readonly isSaving = signal(false);
  /** The server's sentence for the name field (e.g. already used), shown under it. */
  protected readonly nameRefusal = signal<string | null>(null);
  /** A refusal that names no field of the form. */
  protected readonly otherRefusal = signal<string | null>(null);

  /** The fields whose value differs from the set's (trimmed, as the server stores them). */
  private changes(): UpdateInstanceSetRequest {
    const v = this.form.getRawValue();
    const out: Record<string, string> = {};
    for (const key of FIELDS) {
      const value = key === 'visibility' ? v[key] : v[key].trim();
      if (value !== this.set[key]) out[key] = value;
    }
    return out;
  }

  protected async save(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const changes = this.changes();
    if (Object.keys(changes).length === 0) {
      this.dialogRef.close();
      return;
    }
    this.isSaving.set(true);
    this.nameRefusal.set(null);
    this.otherRefusal.set(null);
    try {
      this.dialogRef.close(await firstValueFrom(this.api.update(this.set.id, changes)));
    } catch (err) {
      const refusal = fieldRefusalOf(err, FIELDS);
      if (refusal.field === 'name') {
        this.nameRefusal.set(refusal.message);
        this.form.controls.name.setErrors({ server: true });
        this.form.controls.name.markAsTouched();
      } else {
        this.otherRefusal.set(refusal.field ? `${refusal.field}: ${refusal.message}` : refusal.message);
      }
      this.isSaving.set(false);
    }
  }
}

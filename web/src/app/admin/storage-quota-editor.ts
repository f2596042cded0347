/** One person's storage quota on the admin page: what their sets use, and their own limits (empty = server default). */
import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { DecimalPipe } from '@angular/common';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';
import { AdminApi } from './admin-api';
import { QUOTA_FIELD_LABELS, quotaChangeOf, quotaFieldsOf, quotaLimitValidator } from './storage-quota-rules';

@Component({
  selector: 'app-storage-quota-editor',
  templateUrl: './storage-quota-editor.html',
  styleUrl: './storage-quota-editor.scss',
  imports: [ReactiveFormsModule, DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StorageQuotaEditor {
  private readonly api = inject(AdminApi);
  private readonly fb = inject(NonNullableFormBuilder);
  readonly userId = input.required<number>();
  readonly login = input.required<string>();

  protected readonly kinds = QUOTA_FIELD_LABELS;
  protected readonly quota = rxResource({ params: () => this.userId(), stream: ({ params }) => this.api.quota(params) });
  protected readonly form = this.fb.group({
    files: this.fb.control('', [quotaLimitValidator]),
    cells: this.fb.control('', [quotaLimitValidator]),
    bytes: this.fb.control('', [quotaLimitValidator]),
  });
  /** Whether the new limits are being saved. */
  protected readonly isSaving = signal(false);

  constructor() {
    effect(() => {
      const view = this.quota.value();
      if (view) this.form.setValue(quotaFieldsOf(view));
    });
  }

  /** Saves the limits as the fields say; on refusal the error interceptor shows the server's reason. */
  protected async saveQuota(): Promise<void> {
    if (this.form.invalid) return;
    this.isSaving.set(true);
    try {
      this.quota.set(await firstValueFrom(this.api.changeQuota(this.userId(), quotaChangeOf(this.form.getRawValue()))));
    } catch {
      // Shown by the error interceptor; the fields keep what the admin typed.
    } finally {
      this.isSaving.set(false);
    }
  }
}

/** Rules of the storage quota form: a limit field is a whole number, or empty for the server default. */
import type { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import { MAX_QUOTA_LIMIT, QUOTA_KINDS, type ChangeQuotaRequest, type QuotaKind, type StorageQuotaView } from '@shared/storage-quota';

/** The field text of each limit: empty where the server default applies. */
export type QuotaFields = { [K in QuotaKind]: string };

/** Labels of the kinds, in the order the form shows them. */
export const QUOTA_FIELD_LABELS: readonly { readonly id: QuotaKind; readonly label: string }[] = [
  { id: 'files', label: 'Files' },
  { id: 'cells', label: 'Map cells' },
  { id: 'bytes', label: 'Bytes' },
];

/** A limit field's error, if any: `quotaLimit` when it is neither empty nor a whole number up to MAX_QUOTA_LIMIT. */
export const quotaLimitValidator: ValidatorFn = (control: AbstractControl<string>): ValidationErrors | null => {
  const text = control.value.trim();
  if (text === '') return null;
  return /^\d+$/.test(text) && Number(text) <= MAX_QUOTA_LIMIT ? null : { quotaLimit: true };
};

/** The fields for a view: a person's own limits as numbers, default limits as empty fields. */
export function quotaFieldsOf(view: StorageQuotaView): QuotaFields {
  const field = (k: QuotaKind) => (view.isDefault[k] ? '' : String(view.limits[k]));
  return { files: field('files'), cells: field('cells'), bytes: field('bytes') };
}

/** The PATCH body for the fields: every kind, an empty field as null (back to the default). */
export function quotaChangeOf(fields: QuotaFields): ChangeQuotaRequest {
  const limit = (k: QuotaKind) => (fields[k].trim() === '' ? null : Number(fields[k].trim()));
  return Object.fromEntries(QUOTA_KINDS.map((k) => [k, limit(k)])) as ChangeQuotaRequest;
}

/** Rules of the create-token form, kept out of the component (the server checks them again). */
import type { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import type { TokenScope } from '@shared/api-tokens-contract';

/** Lifetimes offered, in days; the server allows 1 to 365. */
export const TOKEN_LIFETIMES: readonly { readonly days: number; readonly label: string }[] = [
  { days: 7, label: '7 days' },
  { days: 30, label: '30 days' },
  { days: 90, label: '90 days' },
  { days: 365, label: '1 year' },
];

/** What each scope opens, as the page explains it (api/src/api-tokens/token-scopes.ts). */
export const SCOPE_CHOICES: readonly { readonly scope: TokenScope; readonly label: string; readonly hint: string }[] = [
  { scope: 'read', label: 'read', hint: 'every GET you may make: instance sets, maps, scenarios, boards, exports, reports, your sweeps' },
  { scope: 'submit', label: 'submit', hint: 'submit plans from your own solver (POST /api/submissions)' },
  { scope: 'sweep', label: 'sweep', hint: 'launch, preview and cancel sweeps; maintainers and admins only' },
];

/** Valid when at least one scope box is ticked. */
export const atLeastOneScope: ValidatorFn = (group: AbstractControl): ValidationErrors | null =>
  Object.values(group.value as Record<string, boolean>).some((isOn) => isOn) ? null : { noScope: true };

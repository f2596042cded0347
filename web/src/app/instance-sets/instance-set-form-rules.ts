/** Validation rules of the create-set form, matching CreateInstanceSetRequest in shared/instance-sets.ts. */
import { Validators, type ValidatorFn } from '@angular/forms';

/** Name: required, at most 120 characters, not only blanks. */
export const SET_NAME_RULES: ValidatorFn[] = [Validators.required, Validators.maxLength(120), Validators.pattern(/.*\S.*/)];

/** Description: at most 4000 characters. */
export const SET_DESCRIPTION_RULES: ValidatorFn[] = [Validators.maxLength(4000)];

/** Source and licence note: at most 2000 characters. */
export const SET_SOURCE_RULES: ValidatorFn[] = [Validators.maxLength(2000)];

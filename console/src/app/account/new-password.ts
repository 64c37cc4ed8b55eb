import type { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';

/** The API's bounds for a new password (shared/schemas/accounts.ts: PASSWORD_MIN_LENGTH, PASSWORD_MAX_LENGTH). */
export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_LENGTH = 256;

/** A group validator: the `repeat` control must equal the `password` control. */
export const passwordsMatch: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const password = group.get('password')?.value as string | undefined;
  const repeat = group.get('repeat')?.value as string | undefined;
  return repeat && password !== repeat ? { mismatch: true } : null;
};

import type { AbstractControl, ValidationErrors } from '@angular/forms';
import { passwordLength } from '@clearbase/contracts/values';

// the server's password rule, from the contracts
export const minPasswordLength = passwordLength.min;
export const maxPasswordLength = passwordLength.max;

/** A repeat field's check: the same text as its form's `newPassword`. */
export function sameAsNew(control: AbstractControl): ValidationErrors | null {
  const form = control.parent;
  return form && control.value !== form.get('newPassword')?.value ? { mismatch: true } : null;
}

import type { AbstractControl, ValidationErrors } from '@angular/forms';

// The server's password rule (libs/contracts auth/user.ts): 10 to 200 characters.
export const minPasswordLength = 10;
export const maxPasswordLength = 200;

/** A repeat field's check: the same text as its form's `newPassword`. */
export function sameAsNew(control: AbstractControl): ValidationErrors | null {
  const form = control.parent;
  return form && control.value !== form.get('newPassword')?.value ? { mismatch: true } : null;
}

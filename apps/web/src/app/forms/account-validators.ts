import { Validators, type ValidatorFn } from '@angular/forms';
import { emailMaxLength, nameMaxLength } from '@clearbase/contracts/values';
import { maxPasswordLength, minPasswordLength, sameAsNew } from './new-password-rules';

/**
 * The checks of an account's fields, as the server makes them (limits from the contracts), for every form that
 * asks for them. A password to sign in with is only bounded; a new one also has the server's least length.
 * @example fb.group({ email: ['', accountValidators.email], password: ['', accountValidators.password] })
 */
export const accountValidators = {
  name: [Validators.required, Validators.maxLength(nameMaxLength)],
  email: [Validators.required, Validators.email, Validators.maxLength(emailMaxLength)],
  password: [Validators.required, Validators.maxLength(maxPasswordLength)],
  newPassword: [
    Validators.required,
    Validators.minLength(minPasswordLength),
    Validators.maxLength(maxPasswordLength),
  ],
  /** The new password typed again: the same as the form's `newPassword`. */
  repeatPassword: [Validators.required, sameAsNew],
  /** A new password the server makes up when none is given. */
  optionalNewPassword: [Validators.minLength(minPasswordLength), Validators.maxLength(maxPasswordLength)],
} satisfies Record<string, ValidatorFn[]>;

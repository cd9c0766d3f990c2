import type { ValidationErrors } from '@angular/forms';
import { fieldErrorText } from './field-error-text';
import { minPasswordLength } from './new-password-rules';

/** The fields of an account, each with its own words: a name, an e-mail address, a password kept or chosen. */
export type AccountFieldKind = 'name' | 'email' | 'password' | 'new-password' | 'repeat-password';

const requiredWords: Record<AccountFieldKind, string> = {
  name: 'Enter your name',
  email: 'Enter your e-mail address',
  password: 'Enter your password',
  'new-password': 'Choose a password',
  'repeat-password': 'Type the password again',
};

/**
 * The message an account field shows under it for its first failing check: the server's own words, then a missing
 * value, a repeat that differs (the `words` given win, as for a form filled in for someone else), an address
 * that is not one, a password too short, then the general words of `fieldErrorText`.
 * @example accountFieldMessage('email', { email: true }) // 'Enter a valid e-mail address'
 */
export function accountFieldMessage(
  kind: AccountFieldKind,
  errors: ValidationErrors | null | undefined,
  words: { required?: string; mismatch?: string } = {},
): string {
  if (!errors) return '';
  if (errors['server']) return String(errors['server']);
  if (errors['required']) return words.required ?? requiredWords[kind];
  if (errors['mismatch']) return words.mismatch ?? 'The two passwords differ';
  if (errors['email']) return 'Enter a valid e-mail address';
  if (errors['minlength']) return `Use at least ${minPasswordLength} characters`;
  return fieldErrorText(errors);
}

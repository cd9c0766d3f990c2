import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule, type FormControl } from '@angular/forms';
import { MatIconButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { map, startWith, switchMap } from 'rxjs';
import { accountFieldMessage, type AccountFieldKind } from './account-field-message';
import { minPasswordLength } from './new-password-rules';

const defaults: Record<
  AccountFieldKind,
  { label: string; type: string; autocomplete: string; hint?: string }
> = {
  name: { label: 'Name', type: 'text', autocomplete: 'name' },
  email: { label: 'E-mail', type: 'email', autocomplete: 'email' },
  password: { label: 'Password', type: 'password', autocomplete: 'current-password' },
  'new-password': {
    label: 'Password',
    type: 'password',
    autocomplete: 'new-password',
    hint: `At least ${minPasswordLength} characters`,
  },
  'repeat-password': { label: 'The same again', type: 'password', autocomplete: 'new-password' },
};

/**
 * One field of an account form — a name, an e-mail address, a password to sign in with, a new one or its repeat —
 * with the label, the browser's autofill hint and the messages that field has on every page. The server's words
 * for the field show under it: set on the control (`server` error) or given as `problem`.
 */
@Component({
  selector: 'cb-account-field',
  imports: [
    ReactiveFormsModule,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatSuffix,
    MatInput,
    MatIconButton,
    MatIcon,
  ],
  templateUrl: './account-field.html',
  styleUrl: './account-field.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountField {
  readonly kind = input.required<AccountFieldKind>();
  readonly control = input.required<FormControl<string>>();
  /** The input's data-testid. */
  readonly testId = input.required<string>();
  /** The message's data-testid, where a test reads it. */
  readonly errorTestId = input<string>();
  readonly label = input<string>();
  readonly hint = input<string>();
  readonly autocomplete = input<string>();
  /** The words for an empty field, where the form is filled in for someone else. */
  readonly requiredMessage = input<string>();
  /** The words for a repeat that differs, where the form asks for it in its own words. */
  readonly mismatchMessage = input<string>();
  /** The server's words for this field, shown under it. */
  readonly problem = input<string | undefined>();
  /** Whether a password can be shown as typed. */
  readonly revealable = input(false);
  /** Whether the field may stay empty (a password the server makes when none is given). */
  readonly optional = input(false);

  protected readonly shown = signal(false);
  protected readonly settings = computed(() => defaults[this.kind()]);
  protected readonly type = computed(() => (this.shown() ? 'text' : this.settings().type));
  // every change of the control's value, status or touch, so the field shows its message as soon as there is one
  private readonly errors = toSignal(
    toObservable(this.control).pipe(
      switchMap((c) =>
        c.events.pipe(
          startWith(null),
          map(() => c.errors),
        ),
      ),
    ),
  );
  protected readonly message = computed(() =>
    accountFieldMessage(this.kind(), this.errors(), {
      required: this.requiredMessage(),
      mismatch: this.mismatchMessage(),
    }),
  );
}

import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { AccountField } from '../forms/account-field';
import { accountValidators } from '../forms/account-validators';
import { readProblem } from '../problem/read-problem';
import { fieldProblem } from '../signup/field-problem';
import { SignupApi } from '../signup/signup-api';

/** Where a reset or welcome link lands: choose a new password, once. */
@Component({
  selector: 'cb-reset-password-page',
  imports: [ReactiveFormsModule, RouterLink, MatButton, AccountField],
  templateUrl: './reset-password-page.html',
  styleUrl: '../signup/public-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetPasswordPage {
  private readonly api = inject(SignupApi);
  /** Bound from the query string (`?token=…`). */
  readonly token = input<string | undefined>();
  protected readonly fieldProblem = fieldProblem;

  protected readonly form = inject(NonNullableFormBuilder).group({
    newPassword: ['', accountValidators.newPassword],
    repeatPassword: ['', accountValidators.repeatPassword],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly fieldErrors = signal<Readonly<Record<string, string>>>({});
  protected readonly doneFor = signal<string | null>(null);

  constructor() {
    this.form.controls.newPassword.valueChanges.subscribe(() =>
      this.form.controls.repeatPassword.updateValueAndValidity({ emitEvent: false }),
    );
  }

  protected submit(): void {
    this.form.markAllAsTouched();
    const token = this.token();
    if (!token) {
      this.problem.set('This address has no reset token. Open the link from the e-mail again.');
      return;
    }
    if (this.form.invalid || this.busy()) return;
    this.busy.set(true);
    this.problem.set(null);
    this.fieldErrors.set({});
    this.api.confirmPasswordReset({ token, newPassword: this.form.getRawValue().newPassword }).subscribe({
      next: (res) => {
        this.busy.set(false);
        this.doneFor.set(res.email);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const p = readProblem(err);
        this.problem.set(p.message);
        this.fieldErrors.set(p.fieldErrors);
      },
    });
  }
}

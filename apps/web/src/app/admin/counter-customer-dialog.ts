import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { CounterCustomerRequest, UserRecord } from '@clearbase/contracts';
import { fieldErrorText } from '../forms/field-error-text';
import { FormSubmission } from '../forms/form-submission';
import { SubmissionProblem } from '../forms/submission-problem';
import { CustomersApi } from './customers-api';

/**
 * Staff open a customer's account at the counter: a name and an e-mail address. Nobody types a password: the
 * customer gets an e-mail with a link to choose one. Shows that once done, and closes with the new account.
 */
@Component({
  selector: 'cb-counter-customer-dialog',
  imports: [
    SubmissionProblem,
    ReactiveFormsModule,
    MatDialogTitle,
    MatDialogContent,
    MatDialogActions,
    MatDialogClose,
    MatButton,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
  ],
  templateUrl: './counter-customer-dialog.html',
  styleUrl: './create-user-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CounterCustomerDialog {
  private readonly api = inject(CustomersApi);
  private readonly ref = inject<MatDialogRef<CounterCustomerDialog, UserRecord>>(MatDialogRef);

  // 120 and 254 characters: the server's limits (libs/contracts customers/signup.ts, auth/user.ts)
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.required, Validators.maxLength(120)]],
    email: ['', [Validators.required, Validators.email, Validators.maxLength(254)]],
  });
  protected readonly submission = new FormSubmission(this.form);
  protected readonly busy = this.submission.busy;
  protected readonly created = signal<UserRecord | null>(null);

  protected errorOf(field: 'name' | 'email'): string {
    const errors = this.form.controls[field].errors;
    if (errors?.['server']) return fieldErrorText(errors);
    if (errors?.['required'])
      return field === 'name' ? 'Enter the customer’s name' : 'Enter an e-mail address';
    if (errors?.['email']) return 'Enter a valid e-mail address';
    return fieldErrorText(errors);
  }

  protected submit(): void {
    if (!this.submission.ready()) return;
    const { name, email } = this.form.getRawValue();
    const request: CounterCustomerRequest = { name: name.trim(), email: email.trim() };
    this.submission.send(this.api.create(request), (user) => this.created.set(user));
  }

  protected finish(): void {
    this.ref.close(this.created() ?? undefined);
  }
}

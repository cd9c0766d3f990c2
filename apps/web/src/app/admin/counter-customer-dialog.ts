import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import type { CounterCustomerRequest, UserRecord } from '@clearbase/contracts';
import { AccountField } from '../forms/account-field';
import { accountValidators } from '../forms/account-validators';
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
    AccountField,
  ],
  templateUrl: './counter-customer-dialog.html',
  styleUrl: './create-user-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CounterCustomerDialog {
  private readonly api = inject(CustomersApi);
  private readonly ref = inject<MatDialogRef<CounterCustomerDialog, UserRecord>>(MatDialogRef);

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', accountValidators.name],
    email: ['', accountValidators.email],
  });
  protected readonly submission = new FormSubmission(this.form);
  protected readonly busy = this.submission.busy;
  protected readonly created = signal<UserRecord | null>(null);

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

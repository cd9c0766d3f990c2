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
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatOption, MatSelect } from '@angular/material/select';
import type { CreateUserRequest, Role, UserRecord } from '@clearbase/contracts';
import { AccountField } from '../forms/account-field';
import { accountValidators } from '../forms/account-validators';
import { FormSubmission } from '../forms/form-submission';
import { SubmissionProblem } from '../forms/submission-problem';
import { roleChoices, roleLabel } from '../shell/role-label';
import { UsersApi } from './users-api';

/**
 * Creates a user of any role. Without a password the server makes a temporary one; the dialog shows it
 * once, to be handed to the person, and closes with the new user.
 */
@Component({
  selector: 'cb-create-user-dialog',
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
    MatSelect,
    MatOption,
    MatIcon,
    AccountField,
  ],
  templateUrl: './create-user-dialog.html',
  styleUrl: './create-user-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CreateUserDialog {
  private readonly api = inject(UsersApi);
  private readonly ref = inject<MatDialogRef<CreateUserDialog, UserRecord>>(MatDialogRef);

  protected readonly roles = roleChoices;
  protected readonly roleLabel = roleLabel;
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', accountValidators.email],
    name: ['', accountValidators.name],
    role: ['customer' as Role, [Validators.required]],
    password: ['', accountValidators.optionalNewPassword],
  });
  protected readonly submission = new FormSubmission(this.form);
  protected readonly busy = this.submission.busy;
  protected readonly created = signal<{ user: UserRecord; temporaryPassword: string } | null>(null);
  protected readonly copied = signal(false);

  protected submit(): void {
    if (!this.submission.ready()) return;
    const { email, name, role, password } = this.form.getRawValue();
    const request: CreateUserRequest = { email: email.trim(), name: name.trim(), role };
    if (password) request.password = password;
    this.submission.send(this.api.create(request), ({ user, temporaryPassword }) => {
      if (temporaryPassword) this.created.set({ user, temporaryPassword });
      else this.ref.close(user);
    });
  }

  protected copy(text: string): void {
    void navigator.clipboard?.writeText(text).then(() => this.copied.set(true));
  }

  protected finish(): void {
    this.ref.close(this.created()?.user);
  }
}

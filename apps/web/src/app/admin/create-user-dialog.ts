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
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import type { CreateUserRequest, Role, UserRecord } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { roleChoices, roleLabel } from '../shell/role-label';
import { UsersApi } from './users-api';

// The server's password rule (libs/contracts auth/user.ts): 10 to 200 characters.
const minPasswordLength = 10;

/**
 * Creates a user of any role. Without a password the server makes a temporary one; the dialog shows it
 * once, to be handed to the person, and closes with the new user.
 */
@Component({
  selector: 'cb-create-user-dialog',
  imports: [
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
    MatSelect,
    MatOption,
    MatIcon,
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
  protected readonly minPasswordLength = minPasswordLength;
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email, Validators.maxLength(254)]],
    name: ['', [Validators.required, Validators.maxLength(120)]],
    role: ['customer' as Role, [Validators.required]],
    password: ['', [Validators.minLength(minPasswordLength), Validators.maxLength(200)]],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly fieldErrors = signal<Readonly<Record<string, string>>>({});
  protected readonly created = signal<{ user: UserRecord; temporaryPassword: string } | null>(null);
  protected readonly copied = signal(false);

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    const { email, name, role, password } = this.form.getRawValue();
    const request: CreateUserRequest = { email: email.trim(), name: name.trim(), role };
    if (password) request.password = password;
    this.busy.set(true);
    this.problem.set(null);
    this.fieldErrors.set({});
    this.api.create(request).subscribe({
      next: ({ user, temporaryPassword }) => {
        this.busy.set(false);
        if (temporaryPassword) this.created.set({ user, temporaryPassword });
        else this.ref.close(user);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const p = readProblem(err);
        this.problem.set(p.message);
        this.fieldErrors.set(p.fieldErrors);
      },
    });
  }

  protected copy(text: string): void {
    void navigator.clipboard?.writeText(text).then(() => this.copied.set(true));
  }

  protected finish(): void {
    this.ref.close(this.created()?.user);
  }
}

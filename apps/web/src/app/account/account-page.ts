import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { HttpClient } from '@angular/common/http';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import type { ChangePasswordRequest } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { AccountField } from '../forms/account-field';
import { accountValidators } from '../forms/account-validators';
import { readProblem } from '../problem/read-problem';

/** Account: who you are, and changing your password. */
@Component({
  selector: 'cb-account-page',
  imports: [ReactiveFormsModule, MatButton, AccountField],
  templateUrl: './account-page.html',
  styleUrl: './account-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountPage {
  private readonly http = inject(HttpClient);
  protected readonly user = inject(Session).user;

  protected readonly form = inject(NonNullableFormBuilder).group({
    currentPassword: ['', [Validators.required]],
    newPassword: ['', accountValidators.newPassword],
    repeatPassword: ['', accountValidators.repeatPassword],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly fieldErrors = signal<Readonly<Record<string, string>>>({});
  protected readonly done = signal(false);

  constructor() {
    this.form.controls.newPassword.valueChanges.subscribe(() =>
      this.form.controls.repeatPassword.updateValueAndValidity({ emitEvent: false }),
    );
  }

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    const { currentPassword, newPassword } = this.form.getRawValue();
    const body: ChangePasswordRequest = { currentPassword, newPassword };
    this.busy.set(true);
    this.problem.set(null);
    this.fieldErrors.set({});
    this.done.set(false);
    this.http.post<void>('/api/auth/password', body).subscribe({
      next: () => {
        this.busy.set(false);
        this.done.set(true);
        this.form.reset();
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

import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { AccountField } from '../forms/account-field';
import { accountValidators } from '../forms/account-validators';
import { readProblem } from '../problem/read-problem';
import { fieldProblem } from './field-problem';
import { SignupApi } from './signup-api';

/** Sign-up for customers: name, e-mail and password, then "check your mail" until the link is followed. */
@Component({
  selector: 'cb-sign-up-page',
  imports: [ReactiveFormsModule, RouterLink, MatButton, MatProgressBar, AccountField],
  templateUrl: './sign-up-page.html',
  styleUrl: './public-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignUpPage {
  private readonly api = inject(SignupApi);
  protected readonly fieldProblem = fieldProblem;

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', accountValidators.name],
    email: ['', accountValidators.email],
    password: ['', accountValidators.newPassword],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly fieldErrors = signal<Readonly<Record<string, string>>>({});
  /** The server's "check your mail" sentence once the sign-up is sent. */
  protected readonly sent = signal<string | null>(null);

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    this.busy.set(true);
    this.problem.set(null);
    this.fieldErrors.set({});
    this.api.signUp(this.form.getRawValue()).subscribe({
      next: (res) => {
        this.busy.set(false);
        this.sent.set(res.detail);
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

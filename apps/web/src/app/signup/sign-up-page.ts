import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { readProblem } from '../problem/read-problem';
import { fieldProblem } from './field-problem';
import { SignupApi } from './signup-api';

// The server's password rule (libs/contracts auth/user.ts): 10 to 200 characters.
const minPasswordLength = 10;
const maxPasswordLength = 200;

/** Sign-up for customers: name, e-mail and password, then "check your mail" until the link is followed. */
@Component({
  selector: 'cb-sign-up-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
    MatProgressBar,
  ],
  templateUrl: './sign-up-page.html',
  styleUrl: './public-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignUpPage {
  private readonly api = inject(SignupApi);
  protected readonly minPasswordLength = minPasswordLength;
  protected readonly fieldProblem = fieldProblem;

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.required, Validators.maxLength(120)]],
    email: ['', [Validators.required, Validators.email, Validators.maxLength(254)]],
    password: [
      '',
      [Validators.required, Validators.minLength(minPasswordLength), Validators.maxLength(maxPasswordLength)],
    ],
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

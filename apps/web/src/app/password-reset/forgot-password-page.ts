import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { AccountField } from '../forms/account-field';
import { accountValidators } from '../forms/account-validators';
import { readProblem } from '../problem/read-problem';
import { SignupApi } from '../signup/signup-api';

/** Asks for a link to choose a new password; the answer is the same whether the address has an account or not. */
@Component({
  selector: 'cb-forgot-password-page',
  imports: [ReactiveFormsModule, RouterLink, MatButton, AccountField],
  templateUrl: './forgot-password-page.html',
  styleUrl: '../signup/public-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ForgotPasswordPage {
  private readonly api = inject(SignupApi);
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', accountValidators.email],
  });
  protected readonly busy = signal(false);
  protected readonly sent = signal<string | null>(null);
  protected readonly problem = signal<string | null>(null);

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    this.busy.set(true);
    this.problem.set(null);
    this.api.requestPasswordReset(this.form.getRawValue().email).subscribe({
      next: (res) => {
        this.busy.set(false);
        this.sent.set(res.detail);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.problem.set(readProblem(err).message);
      },
    });
  }
}

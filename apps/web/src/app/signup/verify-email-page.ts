import { ChangeDetectionStrategy, Component, type OnInit, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { readProblem } from '../problem/read-problem';
import { SignupApi } from './signup-api';

/** Where the link in the verification mail lands: confirms the address, or offers a fresh link. */
@Component({
  selector: 'cb-verify-email-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatFormField,
    MatLabel,
    MatError,
    MatInput,
    MatProgressBar,
  ],
  templateUrl: './verify-email-page.html',
  styleUrl: './public-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VerifyEmailPage implements OnInit {
  private readonly api = inject(SignupApi);

  /** Bound from the query string (`?token=…`). */
  readonly token = input<string | undefined>();

  protected readonly state = signal<'checking' | 'verified' | 'failed'>('checking');
  protected readonly email = signal('');
  protected readonly problem = signal<string | null>(null);
  protected readonly resent = signal<string | null>(null);
  protected readonly resendForm = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
  });

  ngOnInit(): void {
    const token = this.token();
    if (!token) {
      this.state.set('failed');
      this.problem.set('This address has no confirmation token. Open the link from the e-mail again.');
      return;
    }
    this.api.verify(token).subscribe({
      next: (res) => {
        this.email.set(res.email);
        this.state.set('verified');
      },
      error: (err: unknown) => {
        this.problem.set(readProblem(err).message);
        this.state.set('failed');
      },
    });
  }

  protected resend(): void {
    this.resendForm.markAllAsTouched();
    if (this.resendForm.invalid) return;
    this.api.resendVerification(this.resendForm.getRawValue().email).subscribe({
      next: (res) => this.resent.set(res.detail),
      error: (err: unknown) => this.problem.set(readProblem(err).message),
    });
  }
}

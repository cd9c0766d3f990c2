import { ChangeDetectionStrategy, Component, inject, input, signal, viewChild } from '@angular/core';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatIconButton } from '@angular/material/button';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { readProblem } from '../problem/read-problem';
import { safeReturnUrl } from './safe-return-url';
import { Session } from './session';

/** The sign-in page: e-mail and password, the server's reason when it says no, then back to where the user was. */
@Component({
  selector: 'cb-sign-in-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatIconButton,
    MatFormField,
    MatLabel,
    MatError,
    MatSuffix,
    MatInput,
    MatIcon,
    MatProgressBar,
  ],
  templateUrl: './sign-in-page.html',
  styleUrl: './sign-in-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignInPage {
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  /** Bound from the query string (`?returnUrl=/admin/users`). */
  readonly returnUrl = input<string | undefined>();

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email, Validators.maxLength(254)]],
    password: ['', [Validators.required, Validators.maxLength(200)]],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly fieldErrors = signal<Readonly<Record<string, string>>>({});
  protected readonly showPassword = signal(false);
  private readonly formDirective = viewChild.required(FormGroupDirective);

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    this.busy.set(true);
    this.problem.set(null);
    this.fieldErrors.set({});
    this.session.signIn(this.form.getRawValue()).subscribe({
      next: () => {
        this.busy.set(false);
        void this.router.navigateByUrl(safeReturnUrl(this.returnUrl()));
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const p = readProblem(err);
        this.problem.set(p.status === 429 ? `Too many attempts. ${p.message}` : p.message);
        this.fieldErrors.set(p.fieldErrors);
        // A wrong password is cleared without the empty field at once showing its own error.
        if (p.status === 401)
          this.formDirective().resetForm({ email: this.form.controls.email.value, password: '' });
      },
    });
  }
}

import { ChangeDetectionStrategy, Component, inject, input, signal, viewChild } from '@angular/core';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { Router, RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { AccountField } from '../forms/account-field';
import { accountValidators } from '../forms/account-validators';
import { readProblem } from '../problem/read-problem';
import { safeReturnUrl } from './safe-return-url';
import { Session } from './session';

/** The sign-in page: e-mail and password, the server's reason when it says no, then back to where the user was. */
@Component({
  selector: 'cb-sign-in-page',
  imports: [ReactiveFormsModule, RouterLink, MatButton, MatProgressBar, AccountField],
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
    email: ['', accountValidators.email],
    password: ['', accountValidators.password],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly fieldErrors = signal<Readonly<Record<string, string>>>({});
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

import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { Payment } from '@clearbase/contracts';
import { fieldErrorText } from '../forms/field-error-text';
import { FormSubmission } from '../forms/form-submission';
import { minorDigits, showMoney, toMajor, toMinor } from '../prices/money';
import { PaymentsApi } from '../prices/payments-api';

/** The payment to refund, with the name of the customer it goes back to. */
export interface RefundDialogData {
  payment: Payment;
  customerName: string;
}

/**
 * A manager gives money back: an amount in the payment's currency (all that is left by default), then a second look
 * before the provider is asked. Closes with the updated payment; a refusal shows the server's sentence and puts its
 * complaint about the amount under the field.
 */
@Component({
  selector: 'cb-refund-dialog',
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
    MatSuffix,
    MatInput,
  ],
  templateUrl: './refund-dialog.html',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RefundDialog {
  private readonly api = inject(PaymentsApi);
  private readonly ref = inject<MatDialogRef<RefundDialog, Payment>>(MatDialogRef);
  protected readonly data = inject<RefundDialogData>(MAT_DIALOG_DATA);

  private readonly currency = this.data.payment.currency;
  /** What is left to refund, in minor units. */
  protected readonly leftMinor = this.data.payment.amountMinor - this.data.payment.refundedMinor;
  protected readonly step = 10 ** -minorDigits(this.currency);
  protected readonly form = inject(NonNullableFormBuilder).group({
    amount: [
      toMajor(this.leftMinor, this.currency) as number | null,
      [
        Validators.required,
        Validators.min(this.step),
        Validators.max(toMajor(this.leftMinor, this.currency)),
      ],
    ],
  });
  private readonly submission = new FormSubmission(this.form, (path) =>
    path === 'body.amountMinor' ? this.form.controls.amount : null,
  );
  protected readonly busy = this.submission.busy;
  protected readonly problem = this.submission.problem;
  protected readonly unclaimed = this.submission.unclaimed;
  /** The amount is checked first, then confirmed. */
  protected readonly confirming = signal(false);
  private readonly amountMinor = signal(this.leftMinor);
  protected readonly amountText = computed(() => showMoney(this.amountMinor(), this.currency));
  protected readonly leftText = showMoney(this.leftMinor, this.currency);
  protected readonly paidText = showMoney(this.data.payment.amountMinor, this.currency);

  protected amountError(): string {
    const errors = this.form.controls.amount.errors;
    if (errors?.['min']) return `At least ${showMoney(1, this.currency)}`;
    if (errors?.['max']) return `At most ${this.leftText}, what is left to refund`;
    return fieldErrorText(errors);
  }

  /** First press: check the amount and ask again. */
  protected review(): void {
    if (!this.submission.ready()) return;
    this.amountMinor.set(toMinor(Number(this.form.controls.amount.value), this.currency));
    this.confirming.set(true);
  }

  protected back(): void {
    this.confirming.set(false);
  }

  /** Second press: the provider gives the money back. */
  protected refund(): void {
    if (this.busy()) return;
    this.submission.send(
      this.api.refund(this.data.payment.id, this.amountMinor()),
      (payment) => this.ref.close(payment),
      () => this.confirming.set(false),
    );
  }
}

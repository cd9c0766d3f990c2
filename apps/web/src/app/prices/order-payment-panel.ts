import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import type { OrderBalance, Payment, PaymentStatus } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { readProblem } from '../problem/read-problem';
import { BrowserLocation } from './browser-location';
import { showMoney } from './money';
import { PaymentsApi } from './payments-api';

const statusLabels: Record<PaymentStatus, string> = {
  open: 'Waiting for payment',
  paid: 'Paid',
  declined: 'Declined',
  refunded: 'Refunded',
  'partly-refunded': 'Partly refunded',
};

/**
 * An order's payments as its customer sees them: what was paid or refunded, what is left to pay (rolls added after
 * paying are owed), and paying exactly that on the provider's page. Staff see the payments, and refund, on the order page's own section. Place it
 * on an order's page with `<cb-order-payment-panel [orderId]="id" />`.
 */
@Component({
  selector: 'cb-order-payment-panel',
  imports: [MatButton],
  template: `
    <section class="payment" aria-labelledby="payment-title">
      <h2 id="payment-title">Payment</h2>
      @if (problem(); as message) {
        <div class="cb-problem" role="alert" data-testid="payment-error">{{ message }}</div>
      }
      @for (p of payments(); track p.id) {
        <p data-testid="payment-line">
          {{ showMoney(p.amountMinor, p.currency) }} · {{ statusLabels[p.status] }}
          @if (p.refundedMinor > 0) {
            · {{ showMoney(p.refundedMinor, p.currency) }} refunded
          }
        </p>
      } @empty {
        <p>Not paid yet.</p>
      }
      @if (balance(); as b) {
        @if (b.priceMinor !== null && b.paidMinor > 0 && b.dueMinor) {
          <p data-testid="payment-balance">
            The order now costs {{ showMoney(b.priceMinor, b.currency) }};
            {{ showMoney(b.paidMinor, b.currency) }} is paid and {{ showMoney(b.dueMinor, b.currency) }} is
            left to pay. Your scans can be downloaded once it is paid.
          </p>
        } @else if (b.priceMinor !== null && b.dueMinor) {
          <p data-testid="payment-balance">
            {{ showMoney(b.dueMinor, b.currency) }} to pay. Your scans can be downloaded once it is paid.
          </p>
        } @else if (b.priceMinor === null) {
          <p data-testid="payment-balance">The lab will price this order and tell you what it costs.</p>
        }
      }
      @if (canPay()) {
        <button mat-flat-button type="button" [disabled]="busy()" (click)="pay()" data-testid="payment-pay">
          Pay {{ showMoney(balance()!.dueMinor!, balance()!.currency) }} now
        </button>
      }
    </section>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OrderPaymentPanel {
  private readonly api = inject(PaymentsApi);
  private readonly location = inject(BrowserLocation);
  private readonly role = inject(Session).role;

  readonly orderId = input.required<number>();

  protected readonly payments = signal<Payment[]>([]);
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly statusLabels = statusLabels;
  protected readonly showMoney = showMoney;
  protected readonly balance = signal<OrderBalance | null>(null);
  /** A customer pays what is left, once the price list prices the order. */
  protected readonly canPay = computed(
    () => this.role() === 'customer' && (this.balance()?.dueMinor ?? 0) > 0,
  );

  constructor() {
    effect(() => this.load(this.orderId()));
  }

  private load(orderId: number): void {
    this.api.overview(orderId).subscribe({
      next: (overview) => {
        this.payments.set(overview.payments);
        this.balance.set(overview.balance);
      },
      error: (err: unknown) => this.problem.set(readProblem(err).message),
    });
  }

  protected pay(): void {
    this.busy.set(true);
    this.problem.set(null);
    this.api.checkout(this.orderId()).subscribe({
      next: (res) => this.location.assign(res.checkoutUrl),
      error: (err: unknown) => {
        this.busy.set(false);
        this.problem.set(readProblem(err).message);
      },
    });
  }
}

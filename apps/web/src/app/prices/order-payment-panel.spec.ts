import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import type { OrderBalance, Payment, Role } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { BrowserLocation } from './browser-location';
import { OrderPaymentPanel } from './order-payment-panel';

const paid: Payment = {
  id: 5,
  orderId: 7,
  amountMinor: 4300,
  currency: 'EUR',
  status: 'paid',
  refundedMinor: 0,
  createdAt: '2026-03-02T09:00:00.000Z',
  paidAt: '2026-03-02T09:01:00.000Z',
};

const unpaid: OrderBalance = { currency: 'EUR', priceMinor: 4300, paidMinor: 0, dueMinor: 4300 };
const settled: OrderBalance = { currency: 'EUR', priceMinor: 4300, paidMinor: 4300, dueMinor: 0 };

async function render(role: Role, payments: Payment[], balance: OrderBalance) {
  const assigned: string[] = [];
  TestBed.configureTestingModule({
    imports: [OrderPaymentPanel],
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      { provide: BrowserLocation, useValue: { assign: (url: string) => assigned.push(url) } },
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  TestBed.inject(Session).load().subscribe();
  backend.expectOne('/api/auth/me').flush({ id: 1, email: 'x@lab.test', name: 'X', role });
  const fixture = TestBed.createComponent(OrderPaymentPanel);
  fixture.componentRef.setInput('orderId', 7);
  await fixture.whenStable();
  backend.expectOne('/api/orders/7/payments').flush({ payments, balance });
  await fixture.whenStable();
  return { fixture, backend, assigned };
}

const el = (fixture: ComponentFixture<unknown>, id: string) =>
  (fixture.nativeElement as HTMLElement).querySelector<HTMLElement>(`[data-testid="${id}"]`);

describe('OrderPaymentPanel', () => {
  it('sends the customer to the provider’s checkout page', async () => {
    const { fixture, backend, assigned } = await render('customer', [], unpaid);
    expect(el(fixture, 'payment-balance')?.textContent).toContain('€43.00 to pay');
    expect(el(fixture, 'payment-pay')?.textContent).toContain('Pay €43.00 now');
    el(fixture, 'payment-pay')!.click();
    backend.expectOne({ method: 'POST', url: '/api/orders/7/checkout' }).flush({
      payment: { ...paid, status: 'open', paidAt: null },
      checkoutUrl: 'http://127.0.0.1:4311/checkout/cs_test_1',
    });
    await fixture.whenStable();
    expect(assigned).toEqual(['http://127.0.0.1:4311/checkout/cs_test_1']);
  });

  it('offers no second payment once the order is paid', async () => {
    const { fixture } = await render('customer', [paid], settled);
    expect(el(fixture, 'payment-line')?.textContent).toContain('€43.00 · Paid');
    expect(el(fixture, 'payment-pay')).toBeNull();
    expect(el(fixture, 'payment-balance')).toBeNull();
    expect(el(fixture, 'payment-refund')).toBeNull();
  });

  it('shows what is left to pay once rolls were added after paying, and offers to pay exactly that', async () => {
    const { fixture } = await render('customer', [paid], {
      currency: 'EUR',
      priceMinor: 14300,
      paidMinor: 4300,
      dueMinor: 10000,
    });
    expect(el(fixture, 'payment-balance')?.textContent?.replace(/\s+/g, ' ')).toContain(
      'The order now costs €143.00; €43.00 is paid and €100.00 is left to pay.',
    );
    expect(el(fixture, 'payment-pay')?.textContent).toContain('Pay €100.00 now');
  });

  it('offers no payment to staff', async () => {
    const { fixture } = await render('operator', [], unpaid);
    expect(el(fixture, 'payment-pay')).toBeNull();
  });
});

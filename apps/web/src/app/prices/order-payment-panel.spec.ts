import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import type { Payment, Role } from '@clearbase/contracts';
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

async function render(role: Role, payments: Payment[]) {
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
  backend.expectOne('/api/orders/7/payments').flush({ payments });
  await fixture.whenStable();
  return { fixture, backend, assigned };
}

const el = (fixture: ComponentFixture<unknown>, id: string) =>
  (fixture.nativeElement as HTMLElement).querySelector<HTMLElement>(`[data-testid="${id}"]`);

describe('OrderPaymentPanel', () => {
  it('sends the customer to the provider’s checkout page', async () => {
    const { fixture, backend, assigned } = await render('customer', []);
    el(fixture, 'payment-pay')!.click();
    backend.expectOne({ method: 'POST', url: '/api/orders/7/checkout' }).flush({
      payment: { ...paid, status: 'open', paidAt: null },
      checkoutUrl: 'http://127.0.0.1:4311/checkout/cs_test_1',
    });
    await fixture.whenStable();
    expect(assigned).toEqual(['http://127.0.0.1:4311/checkout/cs_test_1']);
  });

  it('offers no second payment once the order is paid', async () => {
    const { fixture } = await render('customer', [paid]);
    expect(el(fixture, 'payment-line')?.textContent).toContain('€43.00 · Paid');
    expect(el(fixture, 'payment-pay')).toBeNull();
    expect(el(fixture, 'payment-refund')).toBeNull();
  });
});

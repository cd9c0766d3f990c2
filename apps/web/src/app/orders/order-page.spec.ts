import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { OrderBalance, OrderDetail, OrderReadiness, Payment, Role, User } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { testStocks } from '../catalogue/catalogue-testing';
import { testRollDetail } from '../rolls/roll-testing';
import { OrderPage } from './order-page';

const detail: OrderDetail = {
  order: {
    id: 3,
    customerId: 12,
    customerName: 'Marit Olsen',
    status: 'scanning',
    notes: 'Two rolls from the coast.',
    outputFormats: ['jpeg', 'tiff16'],
    scanSize: 'large',
    rollCount: 1,
    negatives: {
      method: 'post',
      address: {
        name: 'Marit Olsen',
        line1: '7 Saltmarsh Lane',
        line2: '',
        town: 'Greywick',
        postcode: 'GW2 9RT',
        country: 'Testland',
      },
    },
    createdAt: '2026-11-20T09:00:00.000Z',
    updatedAt: '2026-11-20T09:00:00.000Z',
  },
  rolls: [testRollDetail([]).roll],
};

const notReady: OrderReadiness = {
  ready: false,
  blocker: null,
  waiting: [{ rollId: 7, rollNumber: 1, reason: 'has 2 frames not approved' }],
  linkValidHours: 168,
};
const allApproved: OrderReadiness = { ready: true, blocker: null, waiting: [], linkValidHours: 168 };

const paidPayment: Payment = {
  id: 5,
  orderId: 3,
  amountMinor: 4300,
  currency: 'EUR',
  status: 'paid',
  refundedMinor: 0,
  createdAt: '2026-11-20T09:05:00.000Z',
  paidAt: '2026-11-20T09:06:00.000Z',
};

async function render(
  role: Role,
  staffAnswers: { readiness?: OrderReadiness; payments?: Payment[]; balance?: OrderBalance } = {},
) {
  TestBed.configureTestingModule({
    imports: [OrderPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  TestBed.inject(Session).load().subscribe();
  const me: User = { id: 1, email: `${role}@lab.test`, name: 'Test', role };
  backend.expectOne('/api/auth/me').flush(me);
  const fixture = TestBed.createComponent(OrderPage);
  fixture.componentRef.setInput('id', '3');
  await fixture.whenStable();
  backend.expectOne('/api/orders/3').flush(detail);
  if (role !== 'customer') {
    backend.expectOne('/api/scanners').flush({ scanners: [] });
    backend.expectOne('/api/orders/3/readiness').flush(staffAnswers.readiness ?? notReady);
    backend.expectOne('/api/orders/3/payments').flush({
      payments: staffAnswers.payments ?? [],
      balance: staffAnswers.balance ?? { currency: 'EUR', priceMinor: 4300, paidMinor: 4300, dueMinor: 0 },
    });
  }
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const byId = (id: string) => root.querySelector(`[data-testid="${id}"]`) as HTMLElement | null;
  return { fixture, backend, root, byId };
}

describe('OrderPage', () => {
  it('draws the way of the order with the steps passed, the current one and those ahead', async () => {
    const { root } = await render('customer');
    const states = [...root.querySelectorAll('[data-testid^="step-"]')].map((li) => [
      li.getAttribute('data-testid'),
      li.getAttribute('data-state'),
    ]);
    expect(states).toEqual([
      ['step-received', 'passed'],
      ['step-developing', 'passed'],
      ['step-scanning', 'current'],
      ['step-tuning', 'ahead'],
      ['step-ready', 'ahead'],
      ['step-delivered', 'ahead'],
    ]);
  });

  it('shows a customer their rolls without links, scanner, profile or staff actions', async () => {
    const { root, byId } = await render('customer');
    expect(byId('roll-row-7')!.textContent).toContain('+1 stop push');
    expect(byId('roll-link-7')).toBeNull();
    expect(byId('add-roll')).toBeNull();
    expect(byId('order-advance')).toBeNull();
    expect([...root.querySelectorAll('th')].map((th) => th.textContent!.trim())).not.toContain('Profile');
  });

  it('tells staff where the negatives go back to', async () => {
    const { byId } = await render('operator');
    expect(byId('order-negatives')!.textContent!.trim()).toBe(
      'Posted back to Marit Olsen, 7 Saltmarsh Lane, Greywick GW2 9RT, Testland',
    );
  });

  it('lets staff move the order to its next status', async () => {
    const { fixture, backend, byId } = await render('operator');
    expect(byId('order-advance')!.textContent).toContain('Move to tuning');
    byId('order-advance')!.click();
    const req = backend.expectOne('/api/orders/3');
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({ status: 'tuning' });
    req.flush({ ...detail.order, status: 'tuning' });
    await fixture.whenStable();
    backend.expectOne('/api/orders/3').flush({ ...detail, order: { ...detail.order, status: 'tuning' } });
    await fixture.whenStable();
    expect(byId('order-status')!.textContent!.trim()).toBe('Tuning');
    expect(byId('roll-link-7')).not.toBeNull();
  });

  it('adds a roll in a dialog that shows the server’s complaint under the field it names', async () => {
    const { fixture, backend, byId } = await render('manager');
    byId('add-roll')!.click();
    await fixture.whenStable();
    backend.expectOne((r) => r.url === '/api/stocks').flush({ stocks: testStocks });
    backend.expectOne('/api/scanners').flush({ scanners: [] });
    await fixture.whenStable();
    const dialog = document.querySelector('cb-add-roll-dialog') as HTMLElement;
    const dialogId = (id: string) => dialog.querySelector(`[data-testid="${id}"]`) as HTMLElement;

    // the stock fills its own EI and frame format
    (dialogId('add-roll-stock') as HTMLElement).click();
    await fixture.whenStable();
    const option = [...document.querySelectorAll('mat-option')].find((o) =>
      o.textContent!.includes('Glasswing'),
    );
    (option as HTMLElement).click();
    await fixture.whenStable();
    expect((dialogId('add-roll-ei') as HTMLInputElement).value).toBe('400');
    expect((dialogId('add-roll-format') as HTMLInputElement).value).toBe('135-36');

    (dialogId('add-roll-submit') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/orders/3/rolls');
    expect(req.request.body).toEqual({ stockId: 1, ei: 400, pushPull: 0, format: '135-36', scannerId: null });
    req.flush(
      {
        type: 'about:blank',
        title: 'Bad Request',
        status: 400,
        detail: 'The request is not valid.',
        errors: [{ path: 'body.ei', message: 'Too big: expected at most 25600' }],
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(dialogId('add-roll-ei-error').textContent!.trim()).toBe('Too big: expected at most 25600');
    expect(dialogId('add-roll-error').textContent).toContain('The request is not valid.');
  });

  it('offers no plain move to Ready or Delivered: an order gets ready through Mark ready, which mails the customer', async () => {
    const { fixture, backend, byId } = await render('operator');
    byId('order-advance')!.click();
    backend.expectOne('/api/orders/3').flush({ ...detail.order, status: 'tuning' });
    await fixture.whenStable();
    backend.expectOne('/api/orders/3').flush({ ...detail, order: { ...detail.order, status: 'tuning' } });
    await fixture.whenStable();
    expect(byId('order-advance')).toBeNull();
    byId('order-move')!.click();
    await fixture.whenStable();
    expect(document.querySelector('[data-testid="order-move-ready"]')).toBeNull();
    // handed over only once ready, as the server allows
    expect(document.querySelector('[data-testid="order-move-delivered"]')).toBeNull();
    expect(document.querySelector('[data-testid="order-move-cancelled"]')).not.toBeNull();
    expect(byId('order-mark-ready')).not.toBeNull();
  });

  it('keeps Mark ready greyed out and says which rolls still wait', async () => {
    const { byId } = await render('operator');
    expect((byId('order-mark-ready') as HTMLButtonElement).disabled).toBe(true);
    expect(byId('order-not-ready')!.textContent!.trim()).toBe('Not yet: roll 1 has 2 frames not approved.');
  });

  it('marks an approved order ready after a confirm saying the customer gets the link by e-mail, then shows it ready', async () => {
    const { fixture, backend, byId } = await render('operator', { readiness: allApproved });
    expect(byId('order-not-ready')).toBeNull();
    byId('order-mark-ready')!.click();
    await fixture.whenStable();
    const confirm = document.querySelector('cb-confirm-dialog') as HTMLElement;
    expect(confirm.textContent).toContain(
      'Marit Olsen will get an e-mail with a link to download the scans of this order; the link works for 7 days.',
    );
    (confirm.querySelector('[data-testid="confirm-ok"]') as HTMLElement).click();
    await fixture.whenStable();

    const req = backend.expectOne('/api/orders/3/ready');
    expect(req.request.method).toBe('POST');
    req.flush({ ...detail.order, status: 'ready' });
    await fixture.whenStable();
    backend.expectOne('/api/orders/3').flush({ ...detail, order: { ...detail.order, status: 'ready' } });
    backend.expectOne('/api/orders/3/readiness').flush(allApproved);
    backend.expectOne('/api/orders/3/payments').flush({ payments: [] });
    await fixture.whenStable();
    expect(byId('step-ready')!.getAttribute('data-state')).toBe('current');
    expect(byId('order-mark-ready')!.textContent).toContain('Send the link again');
  });

  it('sends nothing when the confirm is cancelled', async () => {
    const { fixture, backend, byId } = await render('operator', { readiness: allApproved });
    byId('order-mark-ready')!.click();
    await fixture.whenStable();
    (document.querySelector('[data-testid="confirm-cancel"]') as HTMLElement).click();
    await fixture.whenStable();
    backend.expectNone('/api/orders/3/ready');
  });

  it('shows staff what is left to pay once rolls were added after paying', async () => {
    const { byId } = await render('operator', {
      payments: [paidPayment],
      balance: { currency: 'EUR', priceMinor: 14300, paidMinor: 4300, dueMinor: 10000 },
    });
    expect(byId('staff-payment-due')!.textContent).toContain('€100.00 left to pay of €143.00.');
  });

  it('shows staff the payment state; an operator may not refund', async () => {
    const { byId } = await render('operator', { payments: [paidPayment] });
    expect(byId('staff-payment-line')!.textContent).toContain('€43.00');
    expect(byId('staff-payment-status')!.textContent!.trim()).toBe('Paid');
    expect(byId('staff-payment-refund')).toBeNull();
  });

  it('lets a manager refund part of a payment in the lab’s currency after a second look, with the server’s refusal shown', async () => {
    const { fixture, backend, byId } = await render('manager', { payments: [paidPayment] });
    byId('staff-payment-refund')!.click();
    await fixture.whenStable();
    const dialog = document.querySelector('cb-refund-dialog') as HTMLElement;
    const inDialog = (id: string) => dialog.querySelector(`[data-testid="${id}"]`) as HTMLElement | null;
    const amount = inDialog('refund-amount') as HTMLInputElement;
    expect(amount.value).toBe('43');

    amount.value = '12.5';
    amount.dispatchEvent(new Event('input'));
    inDialog('refund-review')!.click();
    await fixture.whenStable();
    expect(inDialog('refund-confirm-text')!.textContent).toContain('€12.50 of the €43.00 paid goes back');
    inDialog('refund-confirm')!.click();
    const refused = backend.expectOne('/api/payments/5/refund');
    expect(refused.request.body).toEqual({ amountMinor: 1250 });
    refused.flush(
      {
        type: 'about:blank',
        title: 'Bad Request',
        status: 400,
        detail: 'At most €10.00 is left to refund.',
        errors: [{ path: 'body.amountMinor', message: 'Expected at most 1000' }],
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(inDialog('refund-error')!.textContent).toContain('At most €10.00 is left to refund.');
    expect(inDialog('refund-amount-error')!.textContent!.trim()).toBe('Expected at most 1000');

    const again = inDialog('refund-amount') as HTMLInputElement;
    again.value = '10';
    again.dispatchEvent(new Event('input'));
    inDialog('refund-review')!.click();
    await fixture.whenStable();
    inDialog('refund-confirm')!.click();
    const accepted = backend.expectOne('/api/payments/5/refund');
    expect(accepted.request.body).toEqual({ amountMinor: 1000 });
    accepted.flush({ payment: { ...paidPayment, status: 'partly-refunded', refundedMinor: 1000 } });
    await fixture.whenStable();
    expect(byId('staff-payment-status')!.textContent!.trim()).toBe('Partly refunded');
    expect(byId('staff-payment-line')!.textContent).toContain('€10.00 refunded');
  });

  it('refuses a refund above what is left before asking the server', async () => {
    const { fixture, backend, byId } = await render('admin', {
      payments: [{ ...paidPayment, status: 'partly-refunded', refundedMinor: 4000 }],
    });
    byId('staff-payment-refund')!.click();
    await fixture.whenStable();
    const dialog = document.querySelector('cb-refund-dialog') as HTMLElement;
    const amount = dialog.querySelector('[data-testid="refund-amount"]') as HTMLInputElement;
    amount.value = '5';
    amount.dispatchEvent(new Event('input'));
    (dialog.querySelector('[data-testid="refund-review"]') as HTMLElement).click();
    await fixture.whenStable();
    expect(dialog.querySelector('[data-testid="refund-amount-error"]')!.textContent!.trim()).toBe(
      'At most €3.00, what is left to refund',
    );
    backend.expectNone('/api/payments/5/refund');
  });
});

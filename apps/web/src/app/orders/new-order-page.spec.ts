import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter, Router } from '@angular/router';
import type { Order, Quote, Role, User } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { testStocks } from '../catalogue/catalogue-testing';
import { BrowserLocation } from '../prices/browser-location';
import { NewOrderPage } from './new-order-page';

const placed: Order = {
  id: 41,
  customerId: 12,
  customerName: 'Marit Olsen',
  status: 'received',
  notes: '',
  outputFormats: ['jpeg'],
  scanSize: 'standard',
  rollCount: 2,
  negatives: { method: 'collect' },
  createdAt: '2026-11-20T09:00:00.000Z',
  updatedAt: '2026-11-20T09:00:00.000Z',
};

const quote: Quote = {
  currency: 'EUR',
  lines: [
    { rollIndex: 0, kind: 'develop', label: 'Develop 135-36 C-41', amountMinor: 1200 },
    { rollIndex: 0, kind: 'scan', label: 'Scan, large', amountMinor: 1500 },
    { rollIndex: 1, kind: 'develop', label: 'Develop 120 C-41', amountMinor: 1200 },
    { rollIndex: 1, kind: 'scan', label: 'Scan, large', amountMinor: 1500 },
    { rollIndex: 1, kind: 'push-pull', label: 'push 1 stop', amountMinor: 300 },
    { rollIndex: null, kind: 'return-by-post', label: 'Negatives posted back', amountMinor: 450 },
  ],
  totalMinor: 6150,
};

async function render(role: Role) {
  const assigned: string[] = [];
  TestBed.configureTestingModule({
    imports: [NewOrderPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
      { provide: BrowserLocation, useValue: { assign: (url: string) => assigned.push(url) } },
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  TestBed.inject(Session).load().subscribe();
  const me: User = { id: 1, email: `${role}@lab.test`, name: 'Test', role };
  backend.expectOne('/api/auth/me').flush(me);
  const fixture = TestBed.createComponent(NewOrderPage);
  await fixture.whenStable();
  backend.expectOne((r) => r.url === '/api/stocks').flush({ stocks: testStocks });
  if (role !== 'customer') {
    backend.expectOne('/api/orders/customers').flush({
      customers: [{ id: 12, name: 'Marit Olsen', email: 'marit@example.test' }],
    });
  }
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const byId = <T extends HTMLElement = HTMLElement>(id: string) =>
    root.querySelector(`[data-testid="${id}"]`) as T | null;
  const settle = () => fixture.whenStable();
  const click = async (id: string) => {
    byId(id)!.click();
    await settle();
  };
  /** Opens a select and picks the option whose text contains `text`. */
  const choose = async (id: string, text: string) => {
    await click(id);
    const option = [...document.querySelectorAll('mat-option')].find((o) => o.textContent!.includes(text));
    if (!option) throw new Error(`no option "${text}" in ${id}`);
    (option as HTMLElement).click();
    await settle();
    // a multiple select stays open until Escape
    document.dispatchEvent(new KeyboardEvent('keydown', { key: 'Escape' }));
    await settle();
  };
  /** Picks a radio button. */
  const pick = async (id: string) => {
    byId(id)!.querySelector('input')!.click();
    await settle();
  };
  const type = async (id: string, value: string) => {
    const input = byId<HTMLInputElement>(id)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
    await settle();
  };
  const currentStep = () =>
    document
      .querySelector('.mat-step-header[aria-selected="true"] .mat-step-text-label')!
      .textContent!.trim();
  const text = (id: string) => byId(id)?.textContent!.trim() ?? null;
  return { fixture, backend, root, byId, click, choose, pick, type, currentStep, text, assigned, settle };
}

type Page = Awaited<ReturnType<typeof render>>;

/** Two rolls: Glasswing at its box speed on 135-36, Kestrel pushed a stop on 120. */
async function fillRolls(p: Page) {
  await p.choose('roll-0-stock', 'Glasswing');
  await p.click('add-roll-line');
  await p.choose('roll-1-stock', 'Kestrel');
  await p.type('roll-1-ei', '320');
  await p.choose('roll-1-push-pull', '+1 stop push');
  await p.click('rolls-next');
}

afterEach(() => TestBed.resetTestingModule());

// each test walks the stepper through real Material controls: slower than the 5 s default on a busy machine
describe('NewOrderPage', { timeout: 30_000 }, () => {
  it('keeps a customer on the rolls step until each roll has a stock, an EI and a format', async () => {
    const p = await render('customer');
    expect(p.currentStep()).toBe('Rolls');
    expect(p.byId('new-order-customer')).toBeNull();
    await p.click('rolls-next');
    expect(p.currentStep()).toBe('Rolls');
    expect(p.text('roll-0-stock-error')).toBe('Required');
    expect(p.text('roll-0-ei-error')).toBe('Required');

    await p.type('roll-0-ei', '250.5');
    expect(p.text('roll-0-ei-error')).toBe('A whole number');
    await p.choose('roll-0-stock', 'Glasswing');
    // the EI typed is kept; the format comes from the stock
    expect(p.byId<HTMLInputElement>('roll-0-ei')!.value).toBe('250.5');
    expect(p.byId<HTMLInputElement>('roll-0-format')!.value).toBe('135-36');
    await p.click('rolls-next');
    expect(p.currentStep()).toBe('Rolls');
    await p.type('roll-0-ei', '160');
    await p.click('rolls-next');
    expect(p.currentStep()).toBe('Scans');
  });

  it('fills a roll’s EI with its stock’s box speed and shows the push as stops', async () => {
    const p = await render('customer');
    await p.choose('roll-0-stock', 'Bramble');
    // box speed 100, not the sheet's recommended 80
    expect(p.byId<HTMLInputElement>('roll-0-ei')!.value).toBe('100');
    await p.choose('roll-0-push-pull', '+1½ stops push');
    expect(p.text('roll-0-push-pull')).toContain('+1½ stops push');
  });

  it('opens the chosen stock’s sheet in a dialog', async () => {
    const p = await render('customer');
    expect(p.byId('roll-0-sheet')).toBeNull();
    await p.choose('roll-0-stock', 'Glasswing');
    await p.click('roll-0-sheet');
    const sheet = document.querySelector('[data-testid="stock-sheet-view"]');
    expect(sheet!.textContent).toContain('Load by hand.');
  });

  it('needs at least one file format on the scans step', async () => {
    const p = await render('customer');
    await fillRolls(p);
    expect(p.currentStep()).toBe('Scans');
    await p.choose('output-formats', 'JPEG');
    await p.click('scans-next');
    expect(p.currentStep()).toBe('Scans');
    expect(p.text('output-formats-error')).toBe('Choose at least one file format');
    await p.choose('output-formats', 'TIFF');
    await p.click('scans-next');
    expect(p.currentStep()).toBe('Delivery');
  });

  it('asks for a postal address only when the negatives are to be posted back', async () => {
    const p = await render('customer');
    await fillRolls(p);
    await p.click('scans-next');
    expect(p.byId('negatives-address')).toBeNull();
    await p.pick('negatives-post');
    await p.click('delivery-next');
    expect(p.currentStep()).toBe('Delivery');
    expect(p.text('address-line1-error')).toBe('Required');
    await p.pick('negatives-collect');
    await p.click('delivery-next');
    expect(p.currentStep()).toBe('Notes');
  });

  it('shows the server’s price before paying, sends the order with its rolls in one request, then goes to pay', async () => {
    const p = await render('customer');
    await fillRolls(p);
    await p.pick('scan-size-large');
    await p.click('scans-next');
    await p.pick('negatives-post');
    await p.type('address-name', 'Marit Olsen');
    await p.type('address-line1', ' 7 Saltmarsh Lane ');
    await p.type('address-town', 'Greywick');
    await p.type('address-postcode', 'GW2 9RT');
    await p.type('address-country', 'Testland');
    await p.click('delivery-next');
    const notes = p.byId<HTMLTextAreaElement>('new-order-notes')!;
    notes.value = 'The second roll was shot at dusk.';
    notes.dispatchEvent(new Event('input'));
    await p.click('notes-next');
    expect(p.currentStep()).toBe('Review and pay');

    const quoted = p.backend.expectOne('/api/prices/quote');
    expect(quoted.request.body).toEqual({
      scanSize: 'large',
      rolls: [
        { format: '135-36', process: 'C-41', pushPull: 0 },
        { format: '120', process: 'C-41', pushPull: 1 },
      ],
      negatives: 'post',
    });
    expect(p.byId<HTMLButtonElement>('place-order')!.disabled).toBe(true);
    quoted.flush(quote);
    await p.settle();
    expect(p.text('quote-total')).toBe('€61.50');
    const lines = [...p.root.querySelectorAll('[data-testid="quote-line"]')];
    expect(lines).toHaveLength(6);
    expect(lines[5]!.textContent).toContain('Order');
    expect(lines[5]!.textContent).toContain('Negatives posted back');
    expect(p.text('review-negatives')).toBe(
      'Posted back to Marit Olsen, 7 Saltmarsh Lane, Greywick GW2 9RT, Testland',
    );
    expect(
      [...p.root.querySelectorAll('[data-testid="review-roll"]')].map((li) => li.textContent!.trim()),
    ).toEqual(['Glasswing 400, EI 400, Normal, 135-36', 'Kestrel Colour 160, EI 320, +1 stop push, 120']);

    await p.click('place-order');
    const sent = p.backend.expectOne((r) => r.url === '/api/orders' && r.method === 'POST');
    expect(sent.request.body).toEqual({
      notes: 'The second roll was shot at dusk.',
      outputFormats: ['jpeg'],
      scanSize: 'large',
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
      rolls: [
        { stockId: 1, ei: 400, pushPull: 0, format: '135-36', scannerId: null },
        { stockId: 2, ei: 320, pushPull: 1, format: '120', scannerId: null },
      ],
    });
    sent.flush(placed, { status: 201, statusText: 'Created' });
    await p.settle();
    p.backend
      .expectOne('/api/orders/41/checkout')
      .flush({ checkoutUrl: 'http://pay.test/c/1', sessionId: 'c1' }, { status: 201, statusText: 'Created' });
    await p.settle();
    expect(p.assigned).toEqual(['http://pay.test/c/1']);
  });

  it('takes the server’s complaint about the second roll’s EI back to the rolls step, under that field', async () => {
    const p = await render('customer');
    await fillRolls(p);
    await p.click('scans-next');
    await p.click('delivery-next');
    await p.click('notes-next');
    p.backend.expectOne('/api/prices/quote').flush(quote);
    await p.settle();
    await p.click('place-order');
    p.backend
      .expectOne((r) => r.url === '/api/orders' && r.method === 'POST')
      .flush(
        {
          type: 'about:blank',
          title: 'Bad Request',
          status: 400,
          detail: 'The request is not valid.',
          errors: [{ path: 'body.rolls.1.ei', message: 'Too small: expected at least 3' }],
        },
        { status: 400, statusText: 'Bad Request' },
      );
    await p.settle();
    expect(p.currentStep()).toBe('Rolls');
    expect(p.text('roll-1-ei-error')).toBe('Too small: expected at least 3');
    expect(p.text('roll-0-ei-error')).toBeNull();
    expect(p.text('new-order-error')).toContain('The request is not valid.');
  });

  it('says why it cannot price the order and does not let it be placed', async () => {
    const p = await render('customer');
    await p.choose('roll-0-stock', 'Glasswing');
    await p.type('roll-0-format', '127');
    await p.click('rolls-next');
    await p.click('scans-next');
    await p.click('delivery-next');
    await p.click('notes-next');
    p.backend.expectOne('/api/prices/quote').flush(
      {
        type: 'about:blank',
        title: 'Unprocessable Content',
        status: 422,
        detail:
          'The price list has no price for 127 C-41. Ask the lab, or choose another format or scan size.',
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    await p.settle();
    expect(p.text('quote-error')).toContain('no price for 127 C-41');
    expect(p.byId<HTMLButtonElement>('place-order')!.disabled).toBe(true);
  });

  it('lets staff choose whose order it is, and opens the placed order instead of paying', async () => {
    const p = await render('operator');
    expect(p.currentStep()).toBe('Customer');
    await p.click('customer-next');
    expect(p.currentStep()).toBe('Customer');
    expect(p.text('new-order-customer-error')).toBe('Required');
    await p.choose('new-order-customer', 'Marit Olsen');
    await p.click('customer-next');
    await p.choose('roll-0-stock', 'Glasswing');
    await p.click('rolls-next');
    await p.click('scans-next');
    await p.click('delivery-next');
    await p.click('notes-next');
    p.backend.expectOne('/api/prices/quote').flush(quote);
    await p.settle();
    expect(p.text('review-customer')).toBe('Marit Olsen');
    expect(p.text('place-order')).toBe('Place order');
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    await p.click('place-order');
    const sent = p.backend.expectOne((r) => r.url === '/api/orders' && r.method === 'POST');
    expect(sent.request.body).toMatchObject({ customerId: 12, negatives: { method: 'collect' } });
    sent.flush({ ...placed, rollCount: 1 }, { status: 201, statusText: 'Created' });
    await p.settle();
    expect(navigate).toHaveBeenCalledWith(['/orders', 41]);
    expect(p.assigned).toEqual([]);
  });
});

import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import type { UserRecord } from '@clearbase/contracts';
import { CustomersPage } from './customers-page';

const customers: UserRecord[] = [
  {
    id: 21,
    email: 'juno@home.test',
    name: 'Juno Askew',
    role: 'customer',
    disabled: false,
    createdAt: '2026-02-01T10:00:00.000Z',
    lastSignInAt: null,
  },
  {
    id: 22,
    email: 'per@home.test',
    name: 'Per Lindqvist',
    role: 'customer',
    disabled: false,
    createdAt: '2026-02-03T10:00:00.000Z',
    lastSignInAt: '2026-03-01T08:00:00.000Z',
  },
];

async function render() {
  TestBed.configureTestingModule({
    imports: [CustomersPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(CustomersPage);
  backend.expectOne('/api/customers').flush({ customers });
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const byId = (id: string) => root.querySelector(`[data-testid="${id}"]`) as HTMLElement | null;
  const dialogId = (id: string) =>
    document.querySelector(`cb-counter-customer-dialog [data-testid="${id}"]`) as HTMLElement | null;
  const type = (input: HTMLElement | null, value: string) => {
    (input as HTMLInputElement).value = value;
    input!.dispatchEvent(new Event('input'));
  };
  return { fixture, backend, byId, dialogId, type };
}

describe('CustomersPage', () => {
  it('lists the customers and finds one by name or e-mail', async () => {
    const { fixture, byId } = await render();
    expect(byId('customer-row-21')!.textContent).toContain('juno@home.test');
    expect(byId('customer-row-21')!.textContent).toContain('Never');
    const filter = byId('customers-filter') as HTMLInputElement;
    filter.value = 'per@';
    filter.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(byId('customer-row-21')).toBeNull();
    expect(byId('customer-row-22')).not.toBeNull();
  });

  it('opens an account at the counter and says the customer gets an e-mail to choose a password', async () => {
    const { fixture, backend, byId, dialogId, type } = await render();
    byId('new-customer')!.click();
    await fixture.whenStable();
    type(dialogId('counter-customer-name'), '  Tamsin Vell ');
    type(dialogId('counter-customer-email'), 'tamsin@home.test');
    dialogId('counter-customer-submit')!.click();

    const req = backend.expectOne('/api/customers');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ name: 'Tamsin Vell', email: 'tamsin@home.test' });
    const created: UserRecord = { ...customers[0]!, id: 23, name: 'Tamsin Vell', email: 'tamsin@home.test' };
    req.flush({ user: created }, { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(dialogId('counter-customer-done-text')!.textContent).toContain(
      'We sent an e-mail to tamsin@home.test with a link to choose a password.',
    );

    dialogId('counter-customer-done')!.click();
    await fixture.whenStable();
    backend.expectOne('/api/customers').flush({ customers: [...customers, created] });
    await fixture.whenStable();
    expect(byId('customer-row-23')!.textContent).toContain('Tamsin Vell');
  });

  it('checks the fields before sending and puts the server’s complaint under the e-mail', async () => {
    const { fixture, backend, byId, dialogId, type } = await render();
    byId('new-customer')!.click();
    await fixture.whenStable();
    dialogId('counter-customer-submit')!.click();
    await fixture.whenStable();
    backend.expectNone('/api/customers');
    expect(dialogId('counter-customer-name-problem')!.textContent!.trim()).toBe('Enter the customer’s name');
    expect(dialogId('counter-customer-email-problem')!.textContent!.trim()).toBe('Enter an e-mail address');

    type(dialogId('counter-customer-name'), 'Juno Again');
    type(dialogId('counter-customer-email'), 'juno@home.test');
    dialogId('counter-customer-submit')!.click();
    backend.expectOne('/api/customers').flush(
      {
        type: 'about:blank',
        title: 'Conflict',
        status: 409,
        detail: 'An account with the e-mail juno@home.test already exists.',
        errors: [{ path: 'body.email', message: 'Already has an account' }],
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    expect(dialogId('counter-customer-error')!.textContent).toContain(
      'An account with the e-mail juno@home.test already exists.',
    );
    expect(dialogId('counter-customer-email-problem')!.textContent!.trim()).toBe('Already has an account');
  });
});

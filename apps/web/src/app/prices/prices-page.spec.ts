import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import type { PriceList, Role } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { PricesPage } from './prices-page';

const list: PriceList = {
  currency: 'EUR',
  develop: [{ format: '135-36', process: 'C-41', amountMinor: 1200 }],
  scan: [{ size: 'standard', amountMinor: 800 }],
  pushPullPerStopMinor: 300,
  returnByPostMinor: 450,
};

async function render(role: Role) {
  TestBed.configureTestingModule({
    imports: [PricesPage],
    providers: [provideZonelessChangeDetection(), provideHttpClient(), provideHttpClientTesting()],
  });
  const backend = TestBed.inject(HttpTestingController);
  TestBed.inject(Session).load().subscribe();
  backend.expectOne('/api/auth/me').flush({ id: 1, email: 'x@lab.test', name: 'X', role });
  const fixture = TestBed.createComponent(PricesPage);
  await fixture.whenStable();
  backend.expectOne('/api/prices').flush(list);
  await fixture.whenStable();
  return { fixture, backend };
}

const el = (fixture: ComponentFixture<unknown>, id: string) =>
  (fixture.nativeElement as HTMLElement).querySelector<HTMLElement>(`[data-testid="${id}"]`);

describe('PricesPage', () => {
  it('shows the price list in the currency, and no editing, to a customer', async () => {
    const { fixture } = await render('customer');
    expect(el(fixture, 'prices-develop')?.textContent).toContain('€12.00');
    expect(el(fixture, 'prices-scan')?.textContent).toContain('€8.00');
    expect(el(fixture, 'prices-return-by-post')?.textContent).toContain('€4.50 per order');
    expect(el(fixture, 'prices-edit')).toBeNull();
  });

  it('lets a manager change a price and sends it in whole minor units', async () => {
    const { fixture, backend } = await render('manager');
    el(fixture, 'prices-edit')!.click();
    await fixture.whenStable();
    const amount = el(fixture, 'prices-develop-amount-0') as HTMLInputElement;
    expect(amount.value).toBe('12');
    amount.value = '12.35';
    amount.dispatchEvent(new Event('input'));
    const post = el(fixture, 'prices-return-by-post-input') as HTMLInputElement;
    expect(post.value).toBe('4.5');
    post.value = '0';
    post.dispatchEvent(new Event('input'));
    el(fixture, 'prices-save')!.click();
    await fixture.whenStable();

    const req = backend.expectOne({ method: 'PUT', url: '/api/prices' });
    expect(req.request.body).toEqual({
      ...list,
      develop: [{ format: '135-36', process: 'C-41', amountMinor: 1235 }],
      returnByPostMinor: 0,
    });
    req.flush(req.request.body);
    await fixture.whenStable();
    expect(el(fixture, 'prices-develop')?.textContent).toContain('€12.35');
    expect(el(fixture, 'prices-return-by-post')?.textContent).toContain('free');
  });
});

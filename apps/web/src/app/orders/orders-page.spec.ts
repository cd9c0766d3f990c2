import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { Order, Role, User } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { orderColumns, orderTimeline } from './order-labels';
import { OrdersPage } from './orders-page';

const order = (id: number, customerName: string, status: Order['status']): Order => ({
  id,
  customerId: id + 10,
  customerName,
  status,
  notes: '',
  outputFormats: ['jpeg', 'tiff16'],
  scanSize: 'standard',
  rollCount: 2,
  negatives: { method: 'collect' },
  createdAt: '2026-11-20T09:00:00.000Z',
  updatedAt: '2026-11-20T09:00:00.000Z',
});

const orders = [order(5, 'Marit Olsen', 'scanning'), order(4, 'Tobiah Venn', 'received')];

async function render(role: Role) {
  TestBed.configureTestingModule({
    imports: [OrdersPage],
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
  const fixture = TestBed.createComponent(OrdersPage);
  await fixture.whenStable();
  backend.expectOne((r) => r.url === '/api/orders').flush({ orders, total: orders.length });
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const headers = () => [...root.querySelectorAll('th')].map((th) => th.textContent!.trim());
  const rows = () =>
    [...root.querySelectorAll('[data-testid^="order-row-"]')].map((r) => r.getAttribute('data-testid'));
  return { fixture, backend, root, headers, rows };
}

describe('OrdersPage', () => {
  it('shows staff whose order each one is, and lets them find orders by customer', async () => {
    const { fixture, root, headers, rows } = await render('operator');
    expect(headers()).toEqual(['Order', 'Customer', 'Status', 'Rolls', 'Placed']);
    const search = root.querySelector('[data-testid="orders-customer"]') as HTMLInputElement;
    search.value = 'venn';
    search.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(rows()).toEqual(['order-row-4']);
  });

  it('shows a customer the files they asked for instead of a customer column, and no search', async () => {
    const { root, headers } = await render('customer');
    expect(headers()).toEqual(['Order', 'Status', 'Rolls', 'Files', 'Placed']);
    expect(root.querySelector('[data-testid="orders-customer"]')).toBeNull();
    expect(root.querySelector('[data-testid="order-row-5"]')!.textContent).toContain('TIFF (16-bit)');
  });

  it('offers customers and staff alike a new order', async () => {
    for (const role of ['customer', 'operator'] as const) {
      const { root } = await render(role);
      const link = root.querySelector('[data-testid="orders-new"]') as HTMLAnchorElement;
      expect(link.getAttribute('href')).toBe('/orders/new');
      TestBed.resetTestingModule();
    }
  });

  it('asks the server for one status when the filter is set', async () => {
    const { fixture, backend } = await render('manager');
    (fixture.componentInstance as unknown as { status: { set(v: string): void } }).status.set('received');
    await fixture.whenStable();
    const req = backend.expectOne((r) => r.url === '/api/orders');
    expect(req.request.params.get('status')).toBe('received');
    expect(req.request.params.get('limit')).toBe('500');
  });
});

describe('orderColumns', () => {
  it('gives every staff role the customer column and customers the files column', () => {
    for (const role of ['operator', 'manager', 'admin'] as const)
      expect(orderColumns(role)).toContain('customer');
    expect(orderColumns('customer')).not.toContain('customer');
    expect(orderColumns('customer')).toContain('outputs');
  });
});

describe('orderTimeline', () => {
  it('marks the steps before the status passed and the rest ahead', () => {
    expect(orderTimeline('scanning').map((s) => s.state)).toEqual([
      'passed',
      'passed',
      'current',
      'ahead',
      'ahead',
      'ahead',
    ]);
    expect(orderTimeline('cancelled').every((s) => s.state === 'ahead')).toBe(true);
  });
});

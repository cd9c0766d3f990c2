import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { AuditEntry } from '@clearbase/contracts';
import { AuditPage } from './audit-page';
import { setUpListPage } from '../lists/set-up-list-page';

function entries(from: number, count: number): AuditEntry[] {
  return Array.from({ length: count }, (_, i) => ({
    id: from - i,
    at: '2026-12-01T09:00:00.000Z',
    actorId: 1,
    actorEmail: 'ada@lab.test',
    action: i % 2 ? 'user.update' : 'user.create',
    target: `user:${from - i}`,
    details: null,
  }));
}

async function render() {
  const backend = setUpListPage(AuditPage);
  const fixture = TestBed.createComponent(AuditPage);
  await fixture.whenStable();
  return {
    fixture,
    backend,
    page: TestbedHarnessEnvironment.loader(fixture),
  };
}

describe('AuditPage', () => {
  it('asks the server for the first page and shows its entries and total', async () => {
    const { fixture, backend, page } = await render();
    const req = backend.expectOne((r) => r.url === '/api/audit');
    expect(req.request.params.get('limit')).toBe('50');
    expect(req.request.params.get('offset')).toBe('0');
    expect(req.request.params.has('action')).toBe(false);
    req.flush({ entries: entries(120, 50), total: 120 });
    await fixture.whenStable();

    const table = await page.getHarness(MatTableHarness);
    expect(await table.getRows()).toHaveLength(50);
    expect(await (await page.getHarness(MatPaginatorHarness)).getRangeLabel()).toBe('1 – 50 of 120');
  });

  it('asks for the next page by offset when the paginator moves on', async () => {
    const { fixture, backend, page } = await render();
    backend.expectOne((r) => r.url === '/api/audit').flush({ entries: entries(120, 50), total: 120 });
    await fixture.whenStable();

    await (await page.getHarness(MatPaginatorHarness)).goToNextPage();
    const req = backend.expectOne((r) => r.url === '/api/audit');
    expect(req.request.params.get('offset')).toBe('50');
    expect(req.request.params.get('limit')).toBe('50');
    req.flush({ entries: entries(70, 50), total: 120 });
    await fixture.whenStable();

    const cells = await (await page.getHarness(MatTableHarness)).getCellTextByIndex();
    expect(cells[0]).toContain('user:70');
  });

  it('filters by action on the server and starts again at the first page', async () => {
    const { fixture, backend, page } = await render();
    backend.expectOne((r) => r.url === '/api/audit').flush({ entries: entries(120, 50), total: 120 });
    await fixture.whenStable();
    await (await page.getHarness(MatPaginatorHarness)).goToNextPage();
    backend.expectOne((r) => r.url === '/api/audit').flush({ entries: entries(70, 50), total: 120 });
    await fixture.whenStable();

    const filter = await page.getHarness(
      MatInputHarness.with({ selector: '[data-testid="audit-action-filter"]' }),
    );
    await filter.setValue('user.create');
    await new Promise((r) => setTimeout(r, 400));
    await fixture.whenStable();

    const req = backend.expectOne((r) => r.url === '/api/audit');
    expect(req.request.params.get('action')).toBe('user.create');
    expect(req.request.params.get('offset')).toBe('0');
    req.flush({ entries: entries(3, 2), total: 2 });
    await fixture.whenStable();
    expect(await (await page.getHarness(MatTableHarness)).getRows()).toHaveLength(2);
  });

  it('shows the server’s reason when the log cannot be read', async () => {
    const { fixture, backend } = await render();
    backend
      .expectOne((r) => r.url === '/api/audit')
      .flush(
        { title: 'Forbidden', status: 403, detail: 'Only administrators can read the audit log.' },
        { status: 403, statusText: 'Forbidden' },
      );
    await fixture.whenStable();

    const alert = (fixture.nativeElement as HTMLElement).querySelector('[data-testid="audit-error"]');
    expect(alert?.textContent).toContain('Only administrators can read the audit log.');
  });
});

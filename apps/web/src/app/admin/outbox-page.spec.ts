import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import type { OutboxEntry } from '@clearbase/contracts';
import { OutboxPage } from './outbox-page';

const failed: OutboxEntry = {
  id: 40,
  to: 'odile@home.test',
  subject: 'Your scans are ready: order 12',
  kind: 'scans-ready',
  state: 'failed',
  attempts: 12,
  lastError: '550 mailbox unavailable',
  nextAttemptAt: null,
  createdAt: '2026-04-01T08:00:00.000Z',
};
const waiting: OutboxEntry = {
  ...failed,
  id: 41,
  to: 'bram@home.test',
  state: 'pending',
  attempts: 2,
  lastError: 'connect ECONNREFUSED',
  nextAttemptAt: '2026-04-01T08:02:00.000Z',
};

async function render() {
  TestBed.configureTestingModule({
    imports: [OutboxPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(OutboxPage);
  backend.expectOne('/api/admin/outbox?status=failed').flush({ entries: [failed] });
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const byId = (id: string) => root.querySelector(`[data-testid="${id}"]`) as HTMLElement | null;
  return { fixture, backend, byId };
}

describe('OutboxPage', () => {
  it('shows the mail given up on with its recipient, subject, tries and last error', async () => {
    const { byId } = await render();
    const row = byId('outbox-row-40')!.textContent!;
    expect(row).toContain('odile@home.test');
    expect(row).toContain('Your scans are ready: order 12');
    expect(row).toContain('Given up');
    expect(row).toContain('12');
    expect(row).toContain('550 mailbox unavailable');
  });

  it('retries a message now; it leaves the list of those given up on', async () => {
    const { fixture, backend, byId } = await render();
    byId('outbox-retry-40')!.click();
    const req = backend.expectOne('/api/admin/outbox/40/retry');
    expect(req.request.method).toBe('POST');
    req.flush(
      { entry: { ...failed, state: 'pending', nextAttemptAt: '2026-04-01T09:00:00.000Z' } },
      { status: 202, statusText: 'Accepted' },
    );
    await fixture.whenStable();
    expect(byId('outbox-row-40')).toBeNull();
    expect(byId('outbox-empty')!.textContent).toContain('No e-mail was given up on.');
  });

  it('switches to the mail waiting for a retry, with its next try', async () => {
    const { fixture, backend, byId } = await render();
    (byId('outbox-show-pending')!.querySelector('button') as HTMLButtonElement).click();
    await fixture.whenStable();
    backend.expectOne('/api/admin/outbox?status=pending').flush({ entries: [waiting] });
    await fixture.whenStable();
    const row = byId('outbox-row-41')!.textContent!;
    expect(row).toContain('Waiting');
    expect(row).toContain('connect ECONNREFUSED');
    expect(row).toMatch(/1 Apr, \d\d:02:00/);
  });
});

import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { DevMailboxPage } from './dev-mailbox-page';

async function render() {
  TestBed.configureTestingModule({
    imports: [DevMailboxPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(DevMailboxPage);
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  return { fixture, backend, root };
}

describe('DevMailboxPage', () => {
  it('lists the caught mail and points to the outbox for mail that could not be handed over', async () => {
    const { fixture, backend, root } = await render();
    backend.expectOne('/api/dev/mailbox').flush({
      messages: [
        {
          id: 'm-1',
          receivedAt: '2026-04-01T08:00:00.000Z',
          from: 'desk@lab.test',
          to: ['odile@home.test'],
          subject: 'Your scans are ready: order 12',
        },
      ],
    });
    await fixture.whenStable();
    expect(root.querySelector('[data-testid="mailbox-item"]')!.textContent).toContain(
      'Your scans are ready: order 12',
    );
    expect(root.querySelector('[data-testid="mailbox-outbox-link"]')!.getAttribute('href')).toBe(
      '/admin/outbox',
    );
  });

  it('shows the server’s sentence when the local fakes are off', async () => {
    const { fixture, backend, root } = await render();
    backend.expectOne('/api/dev/mailbox').flush(
      {
        type: 'about:blank',
        title: 'Not Found',
        status: 404,
        detail: 'The development mailbox exists only while the local fakes run (LOCAL_FAKES=true).',
      },
      { status: 404, statusText: 'Not Found' },
    );
    await fixture.whenStable();
    expect(root.querySelector('[role="alert"]')!.textContent).toContain('only while the local fakes run');
  });
});

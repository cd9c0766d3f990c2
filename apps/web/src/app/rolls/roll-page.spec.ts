import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { RollDetail, RollEvent } from '@clearbase/contracts';
import { EVENT_SOURCE_FACTORY } from './roll-event-stream';
import { RollPage } from './roll-page';
import { testFrame, testJob, testRollDetail } from './roll-testing';

/** Stands in for the browser's EventSource: the test opens it and sends it events. */
class FakeEventSource {
  readyState = 0;
  closed = false;
  onopen: (() => void) | null = null;
  onerror: (() => void) | null = null;
  private readonly listeners = new Map<string, ((e: MessageEvent<string>) => void)[]>();
  constructor(readonly url: string) {}
  addEventListener(type: string, listener: (e: MessageEvent<string>) => void) {
    this.listeners.set(type, [...(this.listeners.get(type) ?? []), listener]);
  }
  removeEventListener(type: string, listener: (e: MessageEvent<string>) => void) {
    this.listeners.set(
      type,
      (this.listeners.get(type) ?? []).filter((l) => l !== listener),
    );
  }
  close() {
    this.closed = true;
    this.readyState = 2;
  }
  open() {
    this.readyState = 1;
    this.onopen?.();
  }
  send(event: RollEvent) {
    for (const l of this.listeners.get(event.type) ?? []) {
      l(new MessageEvent(event.type, { data: JSON.stringify(event) }));
    }
  }
}

async function render(detail: RollDetail) {
  const sources: FakeEventSource[] = [];
  TestBed.configureTestingModule({
    imports: [RollPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
      {
        provide: EVENT_SOURCE_FACTORY,
        useValue: (url: string) => {
          const source = new FakeEventSource(url);
          sources.push(source);
          return source as unknown as EventSource;
        },
      },
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(RollPage);
  fixture.componentRef.setInput('id', '7');
  await fixture.whenStable();
  backend.expectOne('/api/rolls/7').flush(detail);
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const text = (selector: string) => root.querySelector(selector)?.textContent?.trim() ?? null;
  return { fixture, backend, root, text, sources };
}

describe('RollPage', () => {
  it('opens the roll’s live stream and closes it when the page goes', async () => {
    const { fixture, sources } = await render(testRollDetail([testFrame(1, 'queued')]));
    expect(sources.map((s) => s.url)).toEqual(['/api/rolls/7/events']);
    fixture.destroy();
    expect(sources[0]!.closed).toBe(true);
  });

  it('turns a frame’s chip to done and its thumbnail to the positive when the stream says so, without a reload', async () => {
    const { fixture, backend, text, root, sources } = await render(
      testRollDetail([testFrame(1, 'queued'), testFrame(2, 'queued')], testJob(4, 'running')),
    );
    sources[0]!.send({ type: 'frame', frameId: 101, status: 'inverting', qcFlags: [], error: null });
    await fixture.whenStable();
    expect(text('[data-testid="frame-1"] [data-testid="frame-status"]')).toBe('Inverting');

    sources[0]!.send({
      type: 'frame',
      frameId: 101,
      status: 'done',
      qcFlags: ['clipped-highlights'],
      error: null,
    });
    sources[0]!.send({
      type: 'job',
      job: { ...testJob(4, 'running'), progress: { done: 1, failed: 0, total: 2 } },
    });
    await fixture.whenStable();
    backend.expectNone('/api/rolls/7');
    expect(text('[data-testid="frame-1"] [data-testid="frame-status"]')).toBe('Done');
    expect(text('[data-testid="frame-2"] [data-testid="frame-status"]')).toBe('Queued');
    expect(text('[data-testid="frame-1"] [data-testid="qc-clipped-highlights"]')).toBe('Clipped highlights');
    expect(root.querySelector('[data-testid="frame-1"] img')!.getAttribute('src')).toBe(
      '/api/frames/101/preview?r=-1',
    );
    expect(text('[data-testid="job-progress"]')).toContain('1 of 2 done');
  });

  it('reloads the roll when the stream reconnects and when the job ends', async () => {
    const { fixture, backend, sources } = await render(
      testRollDetail([testFrame(1, 'queued')], testJob(4, 'running')),
    );
    sources[0]!.open();
    await fixture.whenStable();
    backend
      .expectOne('/api/rolls/7')
      .flush(testRollDetail([testFrame(1, 'inverting')], testJob(4, 'running')));
    sources[0]!.send({
      type: 'job',
      job: { ...testJob(4, 'done'), progress: { done: 1, failed: 0, total: 1 } },
    });
    await fixture.whenStable();
    backend.expectOne('/api/rolls/7').flush(testRollDetail([testFrame(1, 'done')], testJob(4, 'done')));
    await fixture.whenStable();
    backend.verify();
  });

  it('reads the roll again once the upload queue has new frames kept', async () => {
    const { fixture, backend, root } = await render(testRollDetail([]));
    const input = root.querySelector('[data-testid="upload-input"]') as HTMLInputElement;
    Object.defineProperty(input, 'files', { value: [new File([new Uint8Array(20)], 'frame-01.tif')] });
    input.dispatchEvent(new Event('change'));
    await fixture.whenStable();
    backend.expectOne('/api/rolls/7/frames').flush({
      accepted: [{ fileName: 'frame-01.tif', frameId: 101, index: 1, duplicate: false, warnings: [] }],
      rejected: [],
    });
    await fixture.whenStable();
    backend.expectOne('/api/rolls/7').flush(testRollDetail([testFrame(1, 'queued')]));
    await fixture.whenStable();
    expect(
      root.querySelector('[data-testid="frame-1"] [data-testid="frame-status"]')!.textContent!.trim(),
    ).toBe('Queued');
  });

  it('shows the job an inversion started and reads the roll again for the frames queued', async () => {
    const { fixture, backend, root } = await render(testRollDetail([testFrame(1, 'queued')]));
    (root.querySelector('[data-testid="invert-roll"]') as HTMLButtonElement).click();
    backend
      .expectOne('/api/rolls/7/invert')
      .flush(testJob(4, 'queued'), { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(root.querySelector('[data-testid="job-state"]')!.textContent!.trim()).toBe(
      'Waiting for the queue',
    );
    backend.expectOne('/api/rolls/7').flush(testRollDetail([testFrame(1, 'queued')], testJob(4, 'queued')));
    await fixture.whenStable();
    expect(root.querySelector('[data-testid="job-cancel"]')).not.toBeNull();
  });

  it('draws the frame’s base rectangle, starts a roll base from it and shows the server’s complaint per field', async () => {
    const frame = {
      ...testFrame(1, 'done'),
      base: {
        mode: 'auto' as const,
        region: null,
        source: 'frame' as const,
        measured: {
          rgb: [0.8, 0.7, 0.6] as [number, number, number],
          region: { x: 0, y: 0, width: 480, height: 20 },
          confidence: 0.9,
        },
      },
    };
    const { fixture, backend, root } = await render(testRollDetail([frame]));
    (root.querySelector('[data-testid="frame-1"] button') as HTMLButtonElement).click();
    await fixture.whenStable();
    const region = root.querySelector('[data-testid="frame-base-region"]') as HTMLElement;
    expect([region.style.left, region.style.top, region.style.width, region.style.height]).toEqual([
      '0%',
      '0%',
      '100%',
      `${(20 / 320) * 100}%`,
    ]);
    expect(root.querySelector('[data-testid="frame-base-source"]')!.textContent).toContain(
      'base found in the frame',
    );

    (root.querySelector('[data-testid="use-for-roll-base"]') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect((root.querySelector('[data-testid="base-height"]') as HTMLInputElement).value).toBe('20');
    (root.querySelector('[data-testid="base-save"]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/rolls/7/base');
    expect(req.request.body).toEqual({
      mode: 'region',
      frameId: 101,
      region: { x: 0, y: 0, width: 480, height: 20 },
    });
    req.flush(
      {
        type: 'about:blank',
        title: 'Unprocessable Content',
        status: 422,
        detail: 'The rectangle holds no film (only bare light or dust).',
        errors: [{ path: 'body.region', message: 'No film in this rectangle' }],
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    await fixture.whenStable();
    expect(root.querySelector('[data-testid="base-error"]')!.textContent).toContain(
      'The rectangle holds no film',
    );
  });

  it('reads the roll again once its base is saved', async () => {
    const { fixture, backend, root } = await render(testRollDetail([testFrame(1, 'done')]));
    (root.querySelector('[data-testid="base-save"]') as HTMLButtonElement).click();
    backend.expectOne('/api/rolls/7/base').flush(testRollDetail([testFrame(1, 'done')]).roll);
    await fixture.whenStable();
    backend.expectOne('/api/rolls/7').flush(testRollDetail([testFrame(1, 'done')]));
    await fixture.whenStable();
    backend.verify();
  });
});

import { provideHttpClient } from '@angular/common/http';
import {
  HttpTestingController,
  provideHttpClientTesting,
  type TestRequest,
} from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { Adjustments, RollTuning, TuningFrame } from '@clearbase/contracts';
import { LINEAR_SCANNER, POLYCLEAR_200, profileForStock, type FrameLevels } from '@clearbase/inversion';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { PreviewReply, PreviewRequest, RenderMessage } from '../preview/preview-messages';
import { PREVIEW_FRAME_SCHEDULER, PREVIEW_PORT_FACTORY, type PreviewPort } from '../preview/preview-renderer';
import { RENDER_POLL_MS, RollWorkspacePage } from './roll-workspace-page';

// written out: the browser code takes only types from the contracts
const zero: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};
const green = (points: number): Adjustments => ({
  ...zero,
  balance: { ...zero.balance, magentaGreen: points },
});

/** An invented frame of roll 7: id 10 + index, rendered to a full-size JPEG unless told otherwise. */
function frame(index: number, patch: Partial<TuningFrame> = {}): TuningFrame {
  return {
    id: 10 + index,
    rollId: 7,
    index,
    fileName: `quay-${index}.tif`,
    width: 600,
    height: 400,
    bitDepth: 16,
    status: 'done',
    qcFlags: [],
    base: { mode: 'auto', region: null, source: 'frame', measured: null },
    adjustments: zero,
    attempts: 1,
    error: null,
    warnings: [],
    outputs: ['jpeg'],
    renderedAt: '2026-11-20T10:00:00.000Z',
    createdAt: '2026-11-20T09:30:00.000Z',
    review: null,
    ...patch,
  };
}

function sheet(frames: TuningFrame[], roll: Adjustments = zero): RollTuning {
  return {
    roll: {
      id: 7,
      orderId: 3,
      stockId: 1,
      stockName: 'Glasswing 400',
      ei: 400,
      pushPull: 0,
      format: '135-36',
      scannerId: null,
      profileVersionId: 9,
      profileVersion: 2,
      status: 'inverted',
      base: { mode: 'auto', frameId: null, region: null, measured: null },
      adjustments: roll,
      frameCount: frames.length,
      createdAt: '2026-11-20T09:00:00.000Z',
      updatedAt: '2026-11-20T09:00:00.000Z',
    },
    profile: profileForStock(POLYCLEAR_200),
    scanner: LINEAR_SCANNER,
    frames,
    approved: false,
  };
}

// invented levels of a normally exposed frame, log10 units
const levels: FrameLevels = {
  midLogExposure: -0.75,
  channelMeans: [-0.74, -0.75, -0.76],
  blackLogExposure: -2.2,
  whiteLogExposure: 0.4,
};

/** A preview worker that answers at once: loaded, then a 2×2 rendering of each request. */
class InstantPort implements PreviewPort {
  onmessage: ((event: MessageEvent<PreviewReply>) => void) | null = null;
  readonly sent: PreviewRequest[] = [];
  postMessage(message: PreviewRequest): void {
    this.sent.push(message);
    const reply: PreviewReply =
      message.kind === 'load'
        ? { kind: 'loaded', width: 2, height: 2, midLogExposure: levels.midLogExposure, measureMs: 1 }
        : {
            kind: 'rendered',
            id: message.id,
            side: message.side,
            width: 2,
            height: 2,
            rgba: new Uint8ClampedArray(16),
            compileMs: 1,
            renderMs: 1,
          };
    queueMicrotask(() => this.onmessage?.({ data: reply } as MessageEvent<PreviewReply>));
  }
  terminate(): void {}
  renders(): RenderMessage[] {
    return this.sent.filter((m): m is RenderMessage => m.kind === 'render');
  }
}

// the page reads the sheet again this often while frames render; short, so a test waits for it in real time
const pollMs = 30;
let backend: HttpTestingController;
let ports: InstantPort[];

/** The working negative's answer: 2×2 pixels of 16-bit counts and the headers the server sends with them. */
function flushNegative(req: TestRequest): void {
  req.flush(new Uint16Array(12).fill(20000).buffer, {
    headers: {
      'X-Negative-Width': '2',
      'X-Negative-Height': '2',
      'X-Film-Base': '0.8,0.8,0.78',
      'X-Film-Base-Source': 'frame',
      'X-Scan-Size': '600x400',
      'X-Frame-Levels': JSON.stringify(levels),
    },
  });
}

async function render(tuning: RollTuning) {
  ports = [];
  TestBed.configureTestingModule({
    imports: [RollWorkspacePage],
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
      {
        provide: PREVIEW_PORT_FACTORY,
        useValue: () => {
          const port = new InstantPort();
          ports.push(port);
          return port;
        },
      },
      { provide: PREVIEW_FRAME_SCHEDULER, useValue: (run: () => void) => queueMicrotask(run) },
      { provide: RENDER_POLL_MS, useValue: pollMs },
    ],
  });
  backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(RollWorkspacePage);
  fixture.componentRef.setInput('id', '7');
  await settle(fixture);
  backend.expectOne('/api/rolls/7/tuning').flush(tuning);
  await settle(fixture);
  flushNegative(backend.expectOne(`/api/frames/${tuning.frames[0]!.id}/working-negative`));
  await settle(fixture);
  return fixture;
}

/** Lets the fake worker's answers and the effects they start run out. */
async function settle(fixture: ComponentFixture<RollWorkspacePage>): Promise<void> {
  for (let i = 0; i < 4; i++) {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  }
}

const host = (f: ComponentFixture<RollWorkspacePage>) => f.nativeElement as HTMLElement;
const q = (f: ComponentFixture<RollWorkspacePage>, id: string) =>
  host(f).querySelector<HTMLElement>(`[data-testid="${id}"]`);
const text = (f: ComponentFixture<RollWorkspacePage>, id: string) => q(f, id)?.textContent?.trim() ?? '';

async function key(f: ComponentFixture<RollWorkspacePage>, k: string, init: KeyboardEventInit = {}) {
  document.dispatchEvent(new KeyboardEvent('keydown', { key: k, bubbles: true, ...init }));
  await settle(f);
}

async function slide(f: ComponentFixture<RollWorkspacePage>, id: string, value: number) {
  const input = q(f, id) as HTMLInputElement;
  input.value = String(value);
  input.dispatchEvent(new Event('input'));
  await settle(f);
}

async function click(f: ComponentFixture<RollWorkspacePage>, id: string) {
  q(f, id)!.click();
  await settle(f);
}

// the first test also pays for loading the page's modules, slow on a busy machine
describe('RollWorkspacePage', { timeout: 20_000 }, () => {
  beforeEach(() => {
    let made = 0;
    // jsdom makes no object URLs; the page only hands them to an <img>
    vi.spyOn(URL, 'createObjectURL').mockImplementation(() => `blob:full-size-${++made}`);
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => undefined);
  });

  afterEach(() => {
    backend.verify();
    vi.restoreAllMocks();
  });

  it('loads the roll and its frames, and previews the first frame', async () => {
    const fixture = await render(sheet([frame(1), frame(2, { adjustments: green(3) }), frame(3)]));
    expect(host(fixture).querySelector('h1')?.textContent).toContain('Glasswing 400 at EI 400');
    expect([...host(fixture).querySelectorAll('.thumb')].map((t) => t.getAttribute('data-testid'))).toEqual([
      'frame-1',
      'frame-2',
      'frame-3',
    ]);
    expect(q(fixture, 'frame-1')?.classList).toContain('current');
    expect(text(fixture, 'carries-2')).toBe('MG +3');
    expect(ports).toHaveLength(1);
    expect(ports[0]!.renders().map((r) => r.side)).toEqual(['before', 'after']);
    expect((q(fixture, 'save') as HTMLButtonElement).disabled).toBe(true);
  });

  it('takes a moved control into the pending adjustments and the live preview', async () => {
    const fixture = await render(sheet([frame(1), frame(2)]));
    const before = ports[0]!.renders().at(-1)!.profile.balance.magentaGreen;
    await slide(fixture, 'cast-magentaGreen', 6);
    expect(text(fixture, 'value-magentaGreen')).toBe('6');
    expect(text(fixture, 'carries-1')).toBe('MG +6');
    expect((q(fixture, 'save') as HTMLButtonElement).disabled).toBe(false);
    const after = ports[0]!.renders().at(-1)!;
    expect(after.side).toBe('after');
    expect(after.profile.balance.magentaGreen).toBeCloseTo(before + 6, 9);
  });

  it('asks before leaving, and holds a closing tab, only while tuning is unsaved', async () => {
    const fixture = await render(sheet([frame(1), frame(2)]));
    const page = fixture.componentInstance;
    const closing = () => {
      const event = new Event('beforeunload', { cancelable: true });
      window.dispatchEvent(event);
      return event.defaultPrevented;
    };
    expect(page.hasUnsavedChanges()).toBe(false);
    expect(closing()).toBe(false);
    await slide(fixture, 'cast-magentaGreen', 2);
    expect(page.hasUnsavedChanges()).toBe(true);
    expect(page.leaveQuestion).toContain('unsaved tuning');
    expect(closing()).toBe(true);
  });

  it('saves the changed frame and the roll, then renders what is pending', async () => {
    const fixture = await render(sheet([frame(1), frame(2)]));
    await slide(fixture, 'cast-magentaGreen', 5);
    await slide(fixture, 'exposure', 2);
    host(fixture).querySelector<HTMLElement>('mat-button-toggle[value="roll"] button')!.click();
    await settle(fixture);
    await slide(fixture, 'cast-yellowBlue', -3);
    await click(fixture, 'save');

    const frameSave = backend.expectOne({ method: 'PUT', url: '/api/frames/11/adjustments' });
    expect(frameSave.request.body).toEqual({ ...green(5), exposureStops: 2 / 6 });
    const rollSave = backend.expectOne({ method: 'PUT', url: '/api/rolls/7/adjustments' });
    expect(rollSave.request.body).toEqual({ ...zero, balance: { ...zero.balance, yellowBlue: -3 } });
    frameSave.flush({});
    rollSave.flush({});
    await settle(fixture);
    const invert = backend.expectOne({ method: 'POST', url: '/api/rolls/7/invert' });
    expect(invert.request.body).toEqual({ frames: 'pending', levels: 'frame' });
    invert.flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1), frame(2)]));
    await settle(fixture);
    expect((q(fixture, 'save') as HTMLButtonElement).disabled).toBe(true);
  });

  it('moves between frames with the arrow keys, stopping at the ends', async () => {
    const fixture = await render(sheet([frame(1), frame(2)]));
    await key(fixture, 'ArrowRight');
    flushNegative(backend.expectOne('/api/frames/12/working-negative'));
    await settle(fixture);
    expect(q(fixture, 'frame-2')?.classList).toContain('current');
    await key(fixture, 'ArrowRight');
    backend.expectNone('/api/frames/12/working-negative');
    await key(fixture, 'ArrowLeft');
    flushNegative(backend.expectOne('/api/frames/11/working-negative'));
    await settle(fixture);
    expect(q(fixture, 'frame-1')?.classList).toContain('current');
  });

  it('undoes and redoes changes with Ctrl Z and Ctrl Shift Z', async () => {
    const fixture = await render(sheet([frame(1)]));
    await slide(fixture, 'cast-cyanRed', 4);
    await slide(fixture, 'cast-cyanRed', 7);
    await key(fixture, 'z', { ctrlKey: true });
    expect(text(fixture, 'value-cyanRed')).toBe('4');
    await key(fixture, 'z', { ctrlKey: true });
    expect(text(fixture, 'value-cyanRed')).toBe('0');
    await key(fixture, 'Z', { ctrlKey: true, shiftKey: true });
    expect(text(fixture, 'value-cyanRed')).toBe('4');
    await click(fixture, 'reset');
    expect(text(fixture, 'value-cyanRed')).toBe('0');
    await key(fixture, 'z', { ctrlKey: true });
    expect(text(fixture, 'value-cyanRed')).toBe('4');
  });

  it('copies the frame’s tuning to the selected frames and saves one request per selected frame', async () => {
    const fixture = await render(sheet([frame(1, { adjustments: green(5) }), frame(2), frame(3), frame(4)]));
    for (const index of [2, 4]) {
      host(fixture).querySelector<HTMLInputElement>(`input[aria-label="Select frame ${index}"]`)!.click();
      await settle(fixture);
    }
    expect(text(fixture, 'copy-to-selected')).toContain('(2)');
    await click(fixture, 'copy-to-selected');
    expect(text(fixture, 'carries-2')).toBe('MG +5');
    expect(text(fixture, 'carries-3')).toBe('');
    expect(text(fixture, 'carries-4')).toBe('MG +5');
    await click(fixture, 'save');
    const saves = backend.match((r) => r.method === 'PUT');
    expect(saves.map((r) => r.request.url).sort()).toEqual([
      '/api/frames/12/adjustments',
      '/api/frames/14/adjustments',
    ]);
    for (const r of saves) expect(r.request.body).toEqual(green(5));
    for (const r of saves) r.flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/invert').flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1, { adjustments: green(5) })]));
    await settle(fixture);
  });

  it('moves the black and white points in sixths of a stop, with reset, undo, copy and save covering them', async () => {
    const fixture = await render(sheet([frame(1), frame(2)]));
    await slide(fixture, 'black-point', 2);
    await slide(fixture, 'white-point', -3);
    expect(text(fixture, 'value-blackPoint')).toBe('+1/3 stop');
    expect(text(fixture, 'value-whitePoint')).toBe('−1/2 stop');
    expect(text(fixture, 'carries-1')).toBe('black +1/3 stop · white −1/2 stop');
    expect(ports[0]!.renders().at(-1)!.side).toBe('after');

    await click(fixture, 'reset');
    expect(text(fixture, 'value-blackPoint')).toBe('0 stops');
    expect(text(fixture, 'value-whitePoint')).toBe('0 stops');
    await key(fixture, 'z', { ctrlKey: true });
    expect(text(fixture, 'value-blackPoint')).toBe('+1/3 stop');
    await key(fixture, 'z', { ctrlKey: true });
    expect(text(fixture, 'value-whitePoint')).toBe('0 stops');
    await key(fixture, 'Z', { ctrlKey: true, shiftKey: true });
    expect(text(fixture, 'value-whitePoint')).toBe('−1/2 stop');

    host(fixture).querySelector<HTMLInputElement>('input[aria-label="Select frame 2"]')!.click();
    await settle(fixture);
    await click(fixture, 'copy-to-selected');
    expect(text(fixture, 'carries-2')).toBe('black +1/3 stop · white −1/2 stop');
    await click(fixture, 'save');
    const saves = backend.match((r) => r.method === 'PUT');
    expect(saves.map((r) => r.request.url).sort()).toEqual([
      '/api/frames/11/adjustments',
      '/api/frames/12/adjustments',
    ]);
    for (const r of saves)
      expect(r.request.body).toEqual({ ...zero, blackPointStops: 2 / 6, whitePointStops: -3 / 6 });
    for (const r of saves) r.flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/invert').flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1), frame(2)]));
    await settle(fixture);
  });

  it('opens the keys help on ? with the 1:1 line, and closes it with Escape', async () => {
    const fixture = await render(sheet([frame(1)]));
    await key(fixture, '?');
    const dialog = host(fixture).querySelector('[role="dialog"]');
    expect(dialog?.getAttribute('aria-label')).toBe('Keyboard keys');
    expect(dialog?.textContent).toContain('Actual pixels (1:1)');
    await key(fixture, 'Escape');
    expect(host(fixture).querySelector('[role="dialog"]')).toBeNull();
  });

  it('shows the saved full-size JPEG at 1:1 on the 1 key, and goes back to fit on Escape', async () => {
    const fixture = await render(sheet([frame(1), frame(2)]));
    await key(fixture, '1');
    const req = backend.expectOne((r) => r.url === '/api/frames/11/output');
    expect(req.request.params.get('format')).toBe('jpeg');
    expect(req.request.headers.get('Cache-Control')).toBe('no-cache');
    expect(req.request.responseType).toBe('blob');
    req.flush(new Blob([new Uint8Array([0xff, 0xd8])], { type: 'image/jpeg' }));
    await settle(fixture);

    const image = q(fixture, 'actual-pixels-image') as HTMLImageElement;
    expect(image.getAttribute('src')).toBe('blob:full-size-1');
    Object.defineProperty(image, 'naturalWidth', { value: 6000 });
    Object.defineProperty(image, 'naturalHeight', { value: 4000 });
    image.dispatchEvent(new Event('load'));
    await settle(fixture);
    // one image pixel per screen pixel at jsdom's ratio of 1, the centre of the frame in the centre
    expect(image.style.width).toBe('6000px');
    expect(image.style.height).toBe('4000px');
    expect(image.style.visibility).toBe('');
    expect(text(fixture, 'actual-pixels-caption')).toContain('1:1 · the saved render, 6000×4000');
    expect(text(fixture, 'actual-pixels')).toBe('1:1');

    await key(fixture, 'Escape');
    expect(q(fixture, 'actual-pixels-view')).toBeNull();
    expect(q(fixture, 'preview-ms')).not.toBeNull();

    // again on the same render: the image is kept, nothing is fetched
    await click(fixture, 'actual-pixels');
    backend.expectNone((r) => r.url === '/api/frames/11/output');
    expect((q(fixture, 'actual-pixels-image') as HTMLImageElement).getAttribute('src')).toBe(
      'blob:full-size-1',
    );
    await key(fixture, '1');
    expect(q(fixture, 'actual-pixels-view')).toBeNull();
  });

  it('says calmly that 1:1 needs a full-size JPEG when the roll was rendered to 16-bit TIFF only', async () => {
    const fixture = await render(sheet([frame(1, { outputs: ['tiff16'] })]));
    await key(fixture, '1');
    backend.expectNone((r) => r.url.includes('/output'));
    expect(text(fixture, 'actual-pixels-note')).toBe(
      '1:1 needs a full-size JPEG output; this roll was rendered to TIFF (16-bit) only.',
    );
    await key(fixture, 'Escape');
    expect(q(fixture, 'actual-pixels-note')).toBeNull();
  });

  it('shows the server’s sentence when a save fails, and keeps every change to save again', async () => {
    const fixture = await render(sheet([frame(1)]));
    await slide(fixture, 'cast-magentaGreen', 8);
    await click(fixture, 'save');
    expect(text(fixture, 'save')).toBe('Saving…');
    expect((q(fixture, 'save') as HTMLButtonElement).disabled).toBe(true);
    backend.expectOne('/api/frames/11/adjustments').flush(
      {
        type: 'about:blank',
        title: 'Conflict',
        status: 409,
        detail: 'The roll is being delivered; tuning is closed.',
      },
      { status: 409, statusText: 'Conflict', headers: { 'content-type': 'application/problem+json' } },
    );
    await settle(fixture);
    expect(text(fixture, 'save-problem')).toContain('The roll is being delivered; tuning is closed.');
    expect(text(fixture, 'save-problem')).toContain('Your changes are still here');
    expect(text(fixture, 'value-magentaGreen')).toBe('8');
    expect((q(fixture, 'save') as HTMLButtonElement).disabled).toBe(false);

    await click(fixture, 'save');
    expect(q(fixture, 'save-problem')).toBeNull();
    const again = backend.expectOne('/api/frames/11/adjustments');
    expect(again.request.body).toEqual(green(8));
    again.flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/invert').flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1, { adjustments: green(8) })]));
    await settle(fixture);
    expect((q(fixture, 'save') as HTMLButtonElement).disabled).toBe(true);
  });

  it('keeps what is edited during a slow save unsaved, and reads the sheet until the frames are rendered', async () => {
    const fixture = await render(sheet([frame(1)]));
    await slide(fixture, 'cast-cyanRed', 2);
    await click(fixture, 'save');
    const slow = backend.expectOne('/api/frames/11/adjustments');
    await slide(fixture, 'cast-cyanRed', 3);
    slow.flush({});
    await settle(fixture);
    backend.expectOne('/api/rolls/7/invert').flush({});
    await settle(fixture);
    // saved at 2, edited to 3 meanwhile: still something to save
    expect((q(fixture, 'save') as HTMLButtonElement).disabled).toBe(false);
    expect(text(fixture, 'value-cyanRed')).toBe('3');
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1, { status: 'queued', outputs: [] })]));
    await settle(fixture);
    expect(q(fixture, 'frame-1')?.textContent).toContain('queued');
    await new Promise((resolve) => setTimeout(resolve, pollMs * 2));
    backend
      .expectOne('/api/rolls/7/tuning')
      .flush(sheet([frame(1, { renderedAt: '2026-11-20T11:00:00.000Z' })]));
    await settle(fixture);
    expect(q(fixture, 'frame-1')?.textContent).toContain('done');
    await new Promise((resolve) => setTimeout(resolve, pollMs * 3));
    backend.expectNone('/api/rolls/7/tuning');
  });
});

import { provideHttpClient } from '@angular/common/http';
import {
  HttpTestingController,
  provideHttpClientTesting,
  type TestRequest,
} from '@angular/common/http/testing';
import { provideZonelessChangeDetection, type Provider, type Type } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { Adjustments, RollTuning, TuningFrame } from '@clearbase/contracts';
import { LINEAR_SCANNER, POLYCLEAR_200, profileForStock, type FrameLevels } from '@clearbase/inversion';
import type { PreviewReply, PreviewRequest, RenderMessage } from '../preview/preview-messages';
import {
  PREVIEW_FRAME_SCHEDULER,
  PREVIEW_PORT_FACTORY,
  PreviewRenderer,
  type PreviewPort,
} from '../preview/preview-renderer';
import { RENDER_POLL_MS, TuningSession } from './tuning-session';

// written out: the browser code takes only types from the contracts
export const zero: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};

/** No tuning but `points` towards green. */
export const green = (points: number): Adjustments => ({
  ...zero,
  balance: { ...zero.balance, magentaGreen: points },
});

/** An invented frame of roll 7: id 10 + index, rendered to a full-size JPEG unless told otherwise. */
export function tuningFrame(index: number, patch: Partial<TuningFrame> = {}): TuningFrame {
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

/** The tuning sheet of roll 7, of an invented stock, with the frames given. */
export function tuningSheet(frames: TuningFrame[], roll: Adjustments = zero): RollTuning {
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
export class InstantPort implements PreviewPort {
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

// the session reads the sheet again this often while frames render; short, so a test waits for it in real time
export const pollMs = 30;

/** The working negative's answer: 2×2 pixels of 16-bit counts and the headers the server sends with them. */
export function flushNegative(req: TestRequest): void {
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

/** Lets the fake worker's answers and the effects they start run out. */
export async function settle(fixture?: ComponentFixture<unknown>): Promise<void> {
  for (let i = 0; i < 4; i++) {
    await new Promise((resolve) => setTimeout(resolve, 0));
    if (fixture) await fixture.whenStable();
    else TestBed.tick();
  }
}

/** What a test of the tuning screen or one of its parts works with. */
export interface TuningTest<T> {
  fixture: ComponentFixture<T>;
  backend: HttpTestingController;
  session: TuningSession;
  /** The fake preview workers started, in order. */
  ports: InstantPort[];
  host: HTMLElement;
  q: (testId: string) => HTMLElement | null;
  text: (testId: string) => string;
  settle: () => Promise<void>;
  key: (key: string, init?: KeyboardEventInit) => Promise<void>;
  slide: (testId: string, value: number) => Promise<void>;
  click: (testId: string) => Promise<void>;
}

/** The test bed of the tuning screen: HTTP, the router and a fake preview worker; `providers` add to them. */
export function configureTuningTest(ports: InstantPort[], providers: Provider[] = []): void {
  TestBed.configureTestingModule({
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
      ...providers,
    ],
  });
}

/**
 * Renders `component` of the tuning screen on roll 7 and answers the sheet and the first frame's negative. A part
 * gets a session of its own from the test bed, opened here; the page (`opensItself`) provides and opens its own.
 */
export async function renderTuning<T>(
  component: Type<T>,
  tuning: RollTuning,
  { opensItself = false } = {},
): Promise<TuningTest<T>> {
  const ports: InstantPort[] = [];
  configureTuningTest(ports, opensItself ? [] : [PreviewRenderer, TuningSession]);
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(component);
  const session = opensItself
    ? fixture.debugElement.injector.get(TuningSession)
    : TestBed.inject(TuningSession);
  if (opensItself) fixture.componentRef.setInput('id', '7');
  else session.open(7);
  const host = fixture.nativeElement as HTMLElement;
  const q = (id: string) => host.querySelector<HTMLElement>(`[data-testid="${id}"]`);
  const run = () => settle(fixture);
  await run();
  backend.expectOne('/api/rolls/7/tuning').flush(tuning);
  await run();
  flushNegative(backend.expectOne(`/api/frames/${tuning.frames[0]!.id}/working-negative`));
  await run();
  return {
    fixture,
    backend,
    session,
    ports,
    host,
    q,
    text: (id) => q(id)?.textContent?.trim() ?? '',
    settle: run,
    key: async (k, init = {}) => {
      document.dispatchEvent(new KeyboardEvent('keydown', { key: k, bubbles: true, ...init }));
      await run();
    },
    slide: async (id, value) => {
      const input = q(id) as HTMLInputElement;
      input.value = String(value);
      input.dispatchEvent(new Event('input'));
      await run();
    },
    click: async (id) => {
      q(id)!.click();
      await run();
    },
  };
}

/** Answers a save that went through: the adjustments still open, the render of what is pending, and the sheet read after. */
export async function answerSave(
  t: Pick<TuningTest<unknown>, 'backend' | 'settle'>,
  after: RollTuning,
): Promise<void> {
  for (const r of t.backend.match((r) => r.method === 'PUT')) r.flush({});
  await t.settle();
  t.backend.expectOne('/api/rolls/7/invert').flush({});
  await t.settle();
  t.backend.expectOne('/api/rolls/7/tuning').flush(after);
  await t.settle();
}

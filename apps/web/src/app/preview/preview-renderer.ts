import { DestroyRef, Injectable, InjectionToken, inject, signal } from '@angular/core';
import type { InversionProfile } from '@clearbase/inversion';
import type { FrameLevels } from '@clearbase/inversion';
import type {
  PreviewNegative,
  PreviewReply,
  PreviewRequest,
  PreviewSide,
  RenderedReply,
} from './preview-messages';

/** What the renderer needs of a Worker; a test can hand in a fake that runs the handler in place. */
export interface PreviewPort {
  postMessage(message: PreviewRequest, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<PreviewReply>) => void) | null;
  terminate(): void;
}

/** Makes the preview's worker; the Angular builder bundles `preview.worker.ts` from this `new URL(…)`. */
export const PREVIEW_PORT_FACTORY = new InjectionToken<() => PreviewPort>('preview port factory', {
  providedIn: 'root',
  factory: () => () =>
    new Worker(new URL('./preview.worker', import.meta.url), { type: 'module' }) as unknown as PreviewPort,
});

/** Schedules work on the next frame; a test can run it at once. */
export const PREVIEW_FRAME_SCHEDULER = new InjectionToken<(run: () => void) => void>(
  'preview frame scheduler',
  {
    providedIn: 'root',
    factory: () => (run) => {
      if (typeof requestAnimationFrame === 'function') requestAnimationFrame(() => run());
      else setTimeout(run, 16);
    },
  },
);

/** A finished rendering with its timings. */
export type PreviewImage = Omit<RenderedReply, 'kind'>;

/**
 * A live before/after preview: one worker per screen, the negative sent once, then renderings of the saved profile
 * ("before") and the edited one ("after"). Requests made within one animation frame collapse to the last one per
 * side, and only one request is in the worker at a time, so a fast slider never queues stale work.
 */
@Injectable()
export class PreviewRenderer {
  private readonly createPort = inject(PREVIEW_PORT_FACTORY);
  private readonly schedule = inject(PREVIEW_FRAME_SCHEDULER);
  private port: PreviewPort | null = null;
  private nextId = 1;
  private busy = false;
  private frameScheduled = false;
  private readonly waiting = new Map<PreviewSide, InversionProfile>();
  private readonly shown = new Map<PreviewSide, number>();

  readonly ready = signal(false);
  readonly before = signal<PreviewImage | null>(null);
  readonly after = signal<PreviewImage | null>(null);
  readonly problem = signal<string | null>(null);
  /** E_mid the previews render at, once the negative is measured. */
  readonly midLogExposure = signal<number | null>(null);

  constructor() {
    inject(DestroyRef).onDestroy(() => this.port?.terminate());
  }

  /**
   * Hands the negative to a fresh worker (its pixels are transferred, so the caller's copy becomes empty); with
   * `levels` the worker renders at their E_mid instead of measuring its own.
   */
  load(negative: PreviewNegative, levelsProfile: InversionProfile, levels?: FrameLevels): void {
    this.port?.terminate();
    this.ready.set(false);
    this.busy = true;
    const port = this.createPort();
    this.port = port;
    port.onmessage = (event) => this.receive(event.data);
    port.postMessage(
      {
        kind: 'load',
        width: negative.width,
        height: negative.height,
        pixels: negative.pixels,
        base: negative.base,
        scanner: negative.scanner,
        levelsProfile,
        ...(levels ? { levels } : {}),
      },
      [negative.pixels.buffer],
    );
  }

  /** Asks for a rendering of one side; the newest request per side wins. */
  render(side: PreviewSide, profile: InversionProfile): void {
    this.waiting.set(side, profile);
    if (this.frameScheduled) return;
    this.frameScheduled = true;
    this.schedule(() => {
      this.frameScheduled = false;
      this.pump();
    });
  }

  private pump(): void {
    if (this.busy || !this.port || !this.ready()) return;
    // the saved side first: it is what the edited side is judged against
    const side: PreviewSide | undefined = this.waiting.has('before')
      ? 'before'
      : this.waiting.has('after')
        ? 'after'
        : undefined;
    if (!side) return;
    const profile = this.waiting.get(side)!;
    this.waiting.delete(side);
    this.busy = true;
    this.port.postMessage({ kind: 'render', id: this.nextId++, side, profile }, []);
  }

  private receive(reply: PreviewReply): void {
    this.busy = false;
    if (reply.kind === 'loaded') {
      this.midLogExposure.set(reply.midLogExposure);
      this.ready.set(true);
    } else if (reply.kind === 'failed') {
      this.problem.set(reply.message);
    } else if (reply.id > (this.shown.get(reply.side) ?? 0)) {
      this.shown.set(reply.side, reply.id);
      this.problem.set(null);
      const { kind: _kind, ...image } = reply;
      (reply.side === 'before' ? this.before : this.after).set(image);
    }
    this.pump();
  }
}

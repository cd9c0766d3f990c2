import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { LINEAR_SCANNER, POLYCLEAR_200, profileForStock, type InversionProfile } from '@clearbase/inversion';
import type { PreviewReply, PreviewRequest, RenderMessage } from './preview-messages';
import {
  PREVIEW_FRAME_SCHEDULER,
  PREVIEW_PORT_FACTORY,
  PreviewRenderer,
  type PreviewPort,
} from './preview-renderer';

const profile: InversionProfile = profileForStock(POLYCLEAR_200);
const withGreen = (magentaGreen: number): InversionProfile => ({
  ...profile,
  balance: { ...profile.balance, magentaGreen },
});

/** A port that records what it is sent and answers only when told to. */
class ManualPort implements PreviewPort {
  onmessage: ((event: MessageEvent<PreviewReply>) => void) | null = null;
  readonly sent: PreviewRequest[] = [];
  postMessage(message: PreviewRequest): void {
    this.sent.push(message);
  }
  terminate(): void {}
  answer(reply: PreviewReply): void {
    this.onmessage?.({ data: reply } as MessageEvent<PreviewReply>);
  }
  rendered(message: RenderMessage): PreviewReply {
    return {
      kind: 'rendered',
      id: message.id,
      side: message.side,
      width: 1,
      height: 1,
      rgba: new Uint8ClampedArray(4),
      compileMs: 1,
      renderMs: 2,
    };
  }
}

function setUp() {
  const port = new ManualPort();
  const frames: (() => void)[] = [];
  TestBed.configureTestingModule({
    providers: [
      provideZonelessChangeDetection(),
      PreviewRenderer,
      { provide: PREVIEW_PORT_FACTORY, useValue: () => port },
      { provide: PREVIEW_FRAME_SCHEDULER, useValue: (run: () => void) => frames.push(run) },
    ],
  });
  const renderer = TestBed.inject(PreviewRenderer);
  renderer.load(
    { width: 1, height: 1, pixels: new Uint16Array(3), base: [0.9, 0.9, 0.9], scanner: LINEAR_SCANNER },
    profile,
  );
  port.answer({ kind: 'loaded', width: 1, height: 1, midLogExposure: -0.7, measureMs: 1 });
  const nextFrame = () => frames.splice(0).forEach((run) => run());
  return { port, renderer, nextFrame };
}

describe('the preview renderer', () => {
  it('sends only the last of the requests made within one frame', () => {
    const { port, renderer, nextFrame } = setUp();
    renderer.render('after', withGreen(1));
    renderer.render('after', withGreen(2));
    renderer.render('after', withGreen(3));
    nextFrame();
    const renders = port.sent.filter((m): m is RenderMessage => m.kind === 'render');
    expect(renders).toHaveLength(1);
    expect(renders[0]!.profile.balance.magentaGreen).toBe(3);
  });

  it('keeps one request in the worker at a time, and sends the newest waiting one when it answers', () => {
    const { port, renderer, nextFrame } = setUp();
    renderer.render('after', withGreen(1));
    nextFrame();
    renderer.render('after', withGreen(2));
    nextFrame();
    renderer.render('after', withGreen(3));
    nextFrame();
    const renders = () => port.sent.filter((m): m is RenderMessage => m.kind === 'render');
    expect(renders()).toHaveLength(1);
    port.answer(port.rendered(renders()[0]!));
    expect(renders()).toHaveLength(2);
    expect(renders()[1]!.profile.balance.magentaGreen).toBe(3);
    expect(renderer.after()).toMatchObject({ id: renders()[0]!.id, compileMs: 1, renderMs: 2 });
  });

  it('renders the saved side before the edited one and never shows an older answer over a newer one', () => {
    const { port, renderer, nextFrame } = setUp();
    renderer.render('after', withGreen(1));
    renderer.render('before', profile);
    nextFrame();
    const first = port.sent.at(-1) as RenderMessage;
    expect(first.side).toBe('before');
    port.answer(port.rendered(first));
    const second = port.sent.at(-1) as RenderMessage;
    expect(second.side).toBe('after');
    port.answer(port.rendered(second));
    // a late duplicate of an older rendering changes nothing
    port.answer({ ...(port.rendered(second) as Extract<PreviewReply, { kind: 'rendered' }>), id: 0 });
    expect(renderer.after()?.id).toBe(second.id);
  });

  it('shows a failure from the worker as the preview’s problem', () => {
    const { port, renderer } = setUp();
    port.answer({
      kind: 'failed',
      id: 4,
      message: 'The preview could not be rendered: x must increase strictly',
    });
    expect(renderer.problem()).toContain('x must increase strictly');
  });
});

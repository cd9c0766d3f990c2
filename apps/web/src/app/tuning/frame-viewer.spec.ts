import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { FrameViewer } from './frame-viewer';
import { renderTuning, tuningFrame as frame, tuningSheet as sheet, type TuningTest } from './tuning-testing';

let t: TuningTest<FrameViewer>;
const render = async (...frames: Parameters<typeof sheet>[0]) =>
  (t = await renderTuning(FrameViewer, sheet(frames)));
const button = (label: string) =>
  [...t.host.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.trim() === label)!;

describe('FrameViewer', { timeout: 20_000 }, () => {
  beforeEach(() => {
    let made = 0;
    // jsdom makes no object URLs; the viewer only hands them to an <img>
    vi.spyOn(URL, 'createObjectURL').mockImplementation(() => `blob:full-size-${++made}`);
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => undefined);
  });

  afterEach(() => {
    t.backend.verify();
    vi.restoreAllMocks();
  });

  it('draws before and after and says how long the preview took', async () => {
    await render(frame(1));
    const canvases = [...t.host.querySelectorAll('canvas')];
    expect(canvases.map((c) => [c.className, c.width, c.height])).toEqual([
      ['before', 2, 2],
      ['after', 2, 2],
    ]);
    expect(t.text('preview-ms')).toBe('Preview 2 ms');
    expect(t.host.querySelector('.split-handle')).not.toBeNull();
  });

  it('counts the renderings drawn on each canvas', async () => {
    await render(frame(1));
    const after = t.q('after-canvas') as HTMLCanvasElement;
    const drawn = Number(after.dataset['renderCount']);
    expect(drawn).toBeGreaterThan(0);
    expect(t.host.querySelector<HTMLCanvasElement>('canvas.before')?.dataset['renderCount']).toBe('1');
    t.session.changeCast('cyanRed', 2);
    await t.settle();
    expect(Number(after.dataset['renderCount'])).toBe(drawn + 1);
  });

  it('shows before or after alone in the toggle view, and both in the split view', async () => {
    await render(frame(1));
    const before = t.host.querySelector('canvas.before') as HTMLCanvasElement;
    const after = t.host.querySelector('.after-layer') as HTMLElement;
    t.host.querySelector<HTMLElement>('mat-button-toggle[value="toggle"] button')!.click();
    await t.settle();
    expect([before.hidden, after.hidden]).toEqual([true, false]);
    button('Showing after').click();
    await t.settle();
    expect([before.hidden, after.hidden]).toEqual([false, true]);
    t.fixture.componentInstance.nextView();
    await t.settle();
    expect([before.hidden, after.hidden]).toEqual([false, false]);
    expect(after.style.clipPath).toBe('inset(0 0 0 50%)');
  });

  it('outlines the film base the frame was read from, when asked', async () => {
    const base = {
      mode: 'auto' as const,
      region: null,
      source: 'frame' as const,
      measured: {
        rgb: [0.8, 0.8, 0.78] as [number, number, number],
        region: { x: 0, y: 380, width: 600, height: 20 },
        confidence: 0.9,
      },
    };
    await render(frame(1, { base }));
    expect(t.q('base-box')).toBeNull();
    button('crop_free Base region').click();
    await t.settle();
    const box = t.q('base-box')!;
    expect([box.style.left, box.style.top, box.style.width, box.style.height]).toEqual([
      '0%',
      '95%',
      '100%',
      '5%',
    ]);
  });

  it('zooms between a half and sixteen times, and back to fit', async () => {
    await render(frame(1));
    const zoom = () => t.host.querySelector('.zoom')?.textContent?.trim();
    for (let i = 0; i < 20; i++) t.fixture.componentInstance.zoomBy(1.25);
    await t.settle();
    expect(zoom()).toBe('1,600 %');
    button('Fit').click();
    await t.settle();
    expect(zoom()).toBe('100 %');
    // four steps of a fifth less would go below a half
    for (let i = 0; i < 4; i++)
      t.host.querySelector<HTMLButtonElement>('button[aria-label="Zoom out"]')!.click();
    await t.settle();
    expect(zoom()).toBe('50 %');
  });

  it('shows the saved full-size JPEG at 1:1, and fetches it once for the same render', async () => {
    await render(frame(1), frame(2));
    await t.click('actual-pixels');
    const req = t.backend.expectOne((r) => r.url === '/api/frames/11/output');
    expect(req.request.params.get('format')).toBe('jpeg');
    expect(req.request.headers.get('Cache-Control')).toBe('no-cache');
    expect(req.request.responseType).toBe('blob');
    req.flush(new Blob([new Uint8Array([0xff, 0xd8])], { type: 'image/jpeg' }));
    await t.settle();

    const image = t.q('actual-pixels-image') as HTMLImageElement;
    expect(image.getAttribute('src')).toBe('blob:full-size-1');
    expect(image.style.visibility).toBe('hidden');
    Object.defineProperty(image, 'naturalWidth', { value: 6000 });
    Object.defineProperty(image, 'naturalHeight', { value: 4000 });
    image.dispatchEvent(new Event('load'));
    await t.settle();
    // one image pixel per screen pixel at jsdom's ratio of 1, the centre of the frame in the centre
    expect(image.style.width).toBe('6000px');
    expect(image.style.height).toBe('4000px');
    expect(image.style.visibility).toBe('');
    expect(t.text('actual-pixels-caption')).toContain('1:1 · the saved render, 6000×4000');
    expect(t.host.querySelector('.zoom')?.textContent?.trim()).toBe('1:1');
    expect(t.text('actual-pixels')).toBe('1:1');

    t.fixture.componentInstance.leaveActual();
    await t.settle();
    expect(t.q('actual-pixels-view')).toBeNull();
    expect(t.q('preview-ms')).not.toBeNull();

    // again on the same render: the image is kept, nothing is fetched
    await t.click('actual-pixels');
    t.backend.expectNone((r) => r.url === '/api/frames/11/output');
    expect((t.q('actual-pixels-image') as HTMLImageElement).getAttribute('src')).toBe('blob:full-size-1');
    await t.click('actual-pixels');
    expect(t.q('actual-pixels-view')).toBeNull();
  });

  it('says in the caption that unsaved changes show at 1:1 once saved', async () => {
    await render(frame(1));
    t.session.changeCast('cyanRed', 2);
    await t.click('actual-pixels');
    t.backend.expectOne((r) => r.url === '/api/frames/11/output').flush(new Blob([]));
    await t.settle();
    expect(t.text('actual-pixels-caption')).toBe(
      '1:1 · the saved render · unsaved changes show here once saved',
    );
  });

  it('says calmly that 1:1 needs a full-size JPEG when the roll was rendered to 16-bit TIFF only', async () => {
    await render(frame(1, { outputs: ['tiff16'] }));
    await t.click('actual-pixels');
    t.backend.expectNone((r) => r.url.includes('/output'));
    expect(t.text('actual-pixels-note')).toBe(
      '1:1 needs a full-size JPEG output; this roll was rendered to TIFF (16-bit) only.',
    );
    t.fixture.componentInstance.fit();
    await t.settle();
    expect(t.q('actual-pixels-note')).toBeNull();
  });

  it('says which frame is still rendering, and offers to try again when the image cannot be shown', async () => {
    await render(frame(1), frame(2, { status: 'inverting', outputs: [] }));
    await t.click('actual-pixels');
    t.backend.expectOne((r) => r.url === '/api/frames/11/output').flush(new Blob([]));
    await t.settle();
    (t.q('actual-pixels-image') as HTMLImageElement).dispatchEvent(new Event('error'));
    await t.settle();
    expect(t.text('actual-pixels-note')).toBe(
      'The full-size render could not be shown. Press 1 again to try once more.',
    );
  });
});

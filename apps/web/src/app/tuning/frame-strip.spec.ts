import { afterEach, describe, expect, it } from 'vitest';
import { FrameStrip } from './frame-strip';
import {
  flushNegative,
  green,
  renderTuning,
  tuningFrame as frame,
  tuningSheet as sheet,
  type TuningTest,
} from './tuning-testing';

let t: TuningTest<FrameStrip>;
const render = async (...frames: Parameters<typeof sheet>[0]) =>
  (t = await renderTuning(FrameStrip, sheet(frames)));

describe('FrameStrip', { timeout: 20_000 }, () => {
  afterEach(() => t.backend.verify());

  it('lists the frames in order, the shown one marked, each with its status or review', async () => {
    const review = {
      decision: 'excluded' as const,
      note: '',
      reviewedBy: 'Operator',
      reviewedAt: '2026-11-20T12:00:00.000Z',
    };
    await render(
      frame(1),
      frame(2, { status: 'queued', qcFlags: ['clipped-highlights'] }),
      frame(3, { review }),
    );
    expect([...t.host.querySelectorAll('.thumb')].map((e) => e.getAttribute('data-testid'))).toEqual([
      'frame-1',
      'frame-2',
      'frame-3',
    ]);
    expect(t.q('frame-1')?.classList).toContain('current');
    expect(t.q('frame-2')?.classList).not.toContain('current');
    expect(t.q('frame-2')?.querySelector('.status')?.textContent).toBe('queued');
    expect(t.q('frame-2')?.querySelector('.flag')?.textContent).toBe('clipped-highlights');
    expect(t.q('frame-3')?.querySelector('.status')?.textContent).toBe('excluded');
  });

  it('shows the positive of a rendered frame and the negative of one still to render', async () => {
    await render(frame(1), frame(2, { status: 'inverting' }));
    expect(t.q('frame-1')?.querySelector('img')?.getAttribute('src')).toBe(
      '/api/frames/11/preview?at=2026-11-20T10:00:00.000Z',
    );
    expect(t.q('frame-2')?.querySelector('img')?.getAttribute('src')).toBe('/api/frames/12/negative-preview');
  });

  it('says what tuning each frame carries, edits not saved yet included', async () => {
    await render(frame(1), frame(2, { adjustments: green(3) }));
    expect(t.text('carries-1')).toBe('');
    expect(t.text('carries-2')).toBe('MG +3');
    t.session.changeExposure(3);
    await t.settle();
    expect(t.text('carries-1')).toBe('+1/2 stop');
  });

  it('shows a frame when its thumbnail is clicked', async () => {
    await render(frame(1), frame(2));
    t.host.querySelector<HTMLButtonElement>('button[aria-label="Frame 2"]')!.click();
    await t.settle();
    flushNegative(t.backend.expectOne('/api/frames/12/working-negative'));
    await t.settle();
    expect(t.q('frame-2')?.classList).toContain('current');
    expect(t.session.frame()?.index).toBe(2);
  });

  it('picks frames for a copy with their ticks, and drops them with a second tick', async () => {
    await render(frame(1), frame(2), frame(3));
    const tick = (index: number) =>
      t.host.querySelector<HTMLInputElement>(`input[aria-label="Select frame ${index}"]`)!;
    tick(2).click();
    tick(3).click();
    await t.settle();
    expect([...t.session.selected()]).toEqual([12, 13]);
    tick(2).click();
    await t.settle();
    expect([...t.session.selected()]).toEqual([13]);
    expect(tick(3).checked).toBe(true);
  });
});

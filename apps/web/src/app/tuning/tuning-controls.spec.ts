import { afterEach, describe, expect, it } from 'vitest';
import { TuningControls } from './tuning-controls';
import {
  answerSave,
  renderTuning,
  tuningFrame as frame,
  tuningSheet as sheet,
  zero,
  type TuningTest,
} from './tuning-testing';

let t: TuningTest<TuningControls>;
const render = async (...frames: Parameters<typeof sheet>[0]) =>
  (t = await renderTuning(TuningControls, sheet(frames)));

describe('TuningControls', { timeout: 20_000 }, () => {
  afterEach(() => t.backend.verify());

  it('takes a moved control into the pending adjustments and the live preview', async () => {
    await render(frame(1), frame(2));
    const before = t.ports[0]!.renders().at(-1)!.profile.balance.magentaGreen;
    await t.slide('cast-magentaGreen', 6);
    expect(t.text('value-magentaGreen')).toBe('6');
    expect(t.session.state().frames[11]?.balance.magentaGreen).toBe(6);
    expect(t.session.unsaved()).toBe(true);
    const after = t.ports[0]!.renders().at(-1)!;
    expect(after.side).toBe('after');
    expect(after.profile.balance.magentaGreen).toBeCloseTo(before + 6, 9);
  });

  it('tunes the whole roll once Whole roll is chosen, leaving the frame’s own tuning as it was', async () => {
    await render(frame(1));
    t.host.querySelector<HTMLElement>('mat-button-toggle[value="roll"] button')!.click();
    await t.settle();
    expect(t.host.querySelector('.hint')?.textContent).toContain('Roll values apply to every frame');
    await t.slide('cast-yellowBlue', -3);
    expect(t.session.state().roll.balance.yellowBlue).toBe(-3);
    expect(t.session.state().frames[11]).toEqual(zero);
  });

  it('moves the black and white points in sixths of a stop, with reset, undo, copy and save covering them', async () => {
    await render(frame(1), frame(2));
    await t.slide('black-point', 2);
    await t.slide('white-point', -3);
    await t.slide('exposure', -4);
    expect(t.text('value-blackPoint')).toBe('+1/3 stop');
    expect(t.text('value-whitePoint')).toBe('−1/2 stop');
    expect(t.text('value-exposure')).toBe('−2/3 stop');
    expect(t.ports[0]!.renders().at(-1)!.side).toBe('after');

    await t.click('reset');
    expect(t.text('value-blackPoint')).toBe('0 stops');
    expect(t.text('value-whitePoint')).toBe('0 stops');
    t.session.undo();
    await t.settle();
    expect(t.text('value-blackPoint')).toBe('+1/3 stop');
    await t.slide('exposure', 0);

    t.session.toggleSelected(12);
    await t.settle();
    expect(t.text('copy-to-selected')).toContain('(1)');
    await t.click('copy-to-selected');
    expect(t.session.state().frames[12]).toEqual({
      ...zero,
      blackPointStops: 2 / 6,
      whitePointStops: -3 / 6,
    });
    t.session.save();
    const saves = t.backend.match((r) => r.method === 'PUT');
    expect(saves.map((r) => r.request.url).sort()).toEqual([
      '/api/frames/11/adjustments',
      '/api/frames/12/adjustments',
    ]);
    for (const r of saves)
      expect(r.request.body).toEqual({ ...zero, blackPointStops: 2 / 6, whitePointStops: -3 / 6 });
    for (const r of saves) r.flush({});
    await answerSave(t, sheet([frame(1), frame(2)]));
  });

  it('offers the copy only once frames are selected', async () => {
    await render(frame(1), frame(2));
    expect((t.q('copy-to-selected') as HTMLButtonElement).disabled).toBe(true);
    t.session.toggleSelected(12);
    await t.settle();
    expect((t.q('copy-to-selected') as HTMLButtonElement).disabled).toBe(false);
  });

  it('draws the negative’s and the positive’s histograms', async () => {
    await render(frame(1));
    const captions = [...t.host.querySelectorAll('figcaption')].map((c) => c.textContent?.trim());
    expect(captions).toEqual(['Negative: density above base 0–3', 'Positive: 0–255']);
    const paths = [...t.host.querySelectorAll('.histograms path')].map((p) => p.getAttribute('d') ?? '');
    expect(paths).toHaveLength(6);
    for (const d of paths) expect(d).toMatch(/^M0,40 L0,.* L100,40 Z$/);
  });

  it('approves the frame with the note written, and shows the review', async () => {
    await render(frame(1));
    const note = t.q('review-note') as HTMLTextAreaElement;
    note.value = 'greys read neutral';
    note.dispatchEvent(new Event('input'));
    await t.settle();
    await t.click('approve');
    const req = t.backend.expectOne({ method: 'POST', url: '/api/frames/11/review' });
    expect(req.request.body).toEqual({ decision: 'approved', note: 'greys read neutral' });
    const review = {
      decision: 'approved' as const,
      note: 'greys read neutral',
      reviewedBy: 'Operator',
      reviewedAt: '2026-11-20T12:00:00.000Z',
    };
    req.flush({ frame: frame(1, { review }), rollApproved: true });
    await t.settle();
    expect(t.text('review')).toBe('approved by Operator: greys read neutral');
    expect((t.q('review-note') as HTMLTextAreaElement).value).toBe('');
  });
});

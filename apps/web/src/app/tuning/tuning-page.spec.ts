import { afterEach, describe, expect, it } from 'vitest';
import { TuningPage } from './tuning-page';
import {
  answerSave,
  flushNegative,
  green,
  renderTuning,
  tuningFrame as frame,
  tuningSheet as sheet,
  type TuningTest,
} from './tuning-testing';

let t: TuningTest<TuningPage>;
const render = async (...frames: Parameters<typeof sheet>[0]) =>
  (t = await renderTuning(TuningPage, sheet(frames), { opensItself: true }));

// the first test also pays for loading the page's modules, slow on a busy machine
describe('TuningPage', { timeout: 20_000 }, () => {
  afterEach(() => t.backend.verify());

  it('loads the roll and its frames, and previews the first frame', async () => {
    await render(frame(1), frame(2, { adjustments: green(3) }), frame(3));
    expect(t.host.querySelector('h1')?.textContent).toContain('Glasswing 400 at EI 400');
    expect([...t.host.querySelectorAll('.thumb')].map((e) => e.getAttribute('data-testid'))).toEqual([
      'frame-1',
      'frame-2',
      'frame-3',
    ]);
    expect(t.q('frame-1')?.classList).toContain('current');
    expect(t.text('carries-2')).toBe('MG +3');
    expect(t.q('after-canvas')).not.toBeNull();
    expect(t.q('cast-magentaGreen')).not.toBeNull();
    expect(t.ports).toHaveLength(1);
    expect(t.ports[0]!.renders().map((r) => r.side)).toEqual(['before', 'after']);
    expect((t.q('save') as HTMLButtonElement).disabled).toBe(true);
  });

  it('asks before leaving, and holds a closing tab, only while tuning is unsaved', async () => {
    await render(frame(1), frame(2));
    const page = t.fixture.componentInstance;
    const closing = () => {
      const event = new Event('beforeunload', { cancelable: true });
      window.dispatchEvent(event);
      return event.defaultPrevented;
    };
    expect(page.hasUnsavedChanges()).toBe(false);
    expect(closing()).toBe(false);
    await t.slide('cast-magentaGreen', 2);
    expect(page.hasUnsavedChanges()).toBe(true);
    expect(page.leaveQuestion).toContain('unsaved tuning');
    expect(closing()).toBe(true);
  });

  it('moves between frames with the arrow keys, stopping at the ends', async () => {
    await render(frame(1), frame(2));
    await t.key('ArrowRight');
    flushNegative(t.backend.expectOne('/api/frames/12/working-negative'));
    await t.settle();
    expect(t.q('frame-2')?.classList).toContain('current');
    await t.key('ArrowRight');
    t.backend.expectNone('/api/frames/12/working-negative');
    await t.key('ArrowLeft');
    flushNegative(t.backend.expectOne('/api/frames/11/working-negative'));
    await t.settle();
    expect(t.q('frame-1')?.classList).toContain('current');
  });

  it('undoes and redoes changes with Ctrl Z and Ctrl Shift Z, and with its buttons', async () => {
    await render(frame(1));
    await t.slide('cast-cyanRed', 4);
    await t.slide('cast-cyanRed', 7);
    await t.key('z', { ctrlKey: true });
    expect(t.text('value-cyanRed')).toBe('4');
    await t.key('z', { ctrlKey: true });
    expect(t.text('value-cyanRed')).toBe('0');
    await t.key('Z', { ctrlKey: true, shiftKey: true });
    expect(t.text('value-cyanRed')).toBe('4');
    t.host.querySelector<HTMLButtonElement>('button[aria-label="Undo"]')!.click();
    await t.settle();
    expect(t.text('value-cyanRed')).toBe('0');
    t.host.querySelector<HTMLButtonElement>('button[aria-label="Redo"]')!.click();
    await t.settle();
    expect(t.text('value-cyanRed')).toBe('4');
  });

  it('leaves a key typed into the note to the note', async () => {
    await render(frame(1), frame(2));
    const note = t.q('review-note') as HTMLTextAreaElement;
    note.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
    note.dispatchEvent(new KeyboardEvent('keydown', { key: 's', bubbles: true }));
    await t.settle();
    t.backend.expectNone('/api/frames/12/working-negative');
    expect(t.q('frame-1')?.classList).toContain('current');
  });

  it('opens the keys help on ? with the 1:1 line, and closes it with Escape', async () => {
    await render(frame(1));
    await t.key('?');
    const dialog = t.host.querySelector('[role="dialog"]');
    expect(dialog?.getAttribute('aria-label')).toBe('Keyboard keys');
    expect(dialog?.textContent).toContain('Actual pixels (1:1)');
    await t.key('Escape');
    expect(t.host.querySelector('[role="dialog"]')).toBeNull();
  });

  it('goes to 1:1 on the 1 key, and back to fit on Escape or on 1 again', async () => {
    await render(frame(1, { outputs: ['tiff16'] }));
    await t.key('1');
    expect(t.q('actual-pixels-view')).not.toBeNull();
    await t.key('Escape');
    expect(t.q('actual-pixels-view')).toBeNull();
    await t.key('1');
    await t.key('1');
    expect(t.q('actual-pixels-view')).toBeNull();
  });

  it('shows the server’s sentence when a save fails, and keeps every change to save again', async () => {
    await render(frame(1));
    await t.slide('cast-magentaGreen', 8);
    await t.key('s');
    expect(t.text('save')).toBe('Saving…');
    expect((t.q('save') as HTMLButtonElement).disabled).toBe(true);
    t.backend.expectOne('/api/frames/11/adjustments').flush(
      {
        type: 'about:blank',
        title: 'Conflict',
        status: 409,
        detail: 'The roll is being delivered; tuning is closed.',
      },
      { status: 409, statusText: 'Conflict', headers: { 'content-type': 'application/problem+json' } },
    );
    await t.settle();
    expect(t.text('save-problem')).toContain('The roll is being delivered; tuning is closed.');
    expect(t.text('save-problem')).toContain('Your changes are still here');
    expect(t.text('value-magentaGreen')).toBe('8');
    expect((t.q('save') as HTMLButtonElement).disabled).toBe(false);

    await t.click('save');
    expect(t.q('save-problem')).toBeNull();
    const again = t.backend.expectOne('/api/frames/11/adjustments');
    expect(again.request.body).toEqual(green(8));
    again.flush({});
    await answerSave(t, sheet([frame(1, { adjustments: green(8) })]));
    expect((t.q('save') as HTMLButtonElement).disabled).toBe(true);
  });
});

import { describe, expect, it } from 'vitest';
import { tuningKeys } from './tuning-keys';

const press = (key: string, init: KeyboardEventInit = {}) =>
  tuningKeys.actionOf(new KeyboardEvent('keydown', { key, ...init }));

describe('tuningKeys', () => {
  it('maps the letters in either case, the arrows and Escape to their actions', () => {
    expect(press('ArrowLeft')).toBe('previous-frame');
    expect(press('ArrowRight')).toBe('next-frame');
    expect(press('b')).toBe('before-after');
    expect(press('V')).toBe('next-view');
    expect(press('n')).toBe('neutral-picker');
    expect(press('f')).toBe('base-region');
    expect(press('0')).toBe('fit');
    expect(press('1')).toBe('actual-pixels');
    expect(press('+')).toBe('zoom-in');
    expect(press('=')).toBe('zoom-in');
    expect(press('-')).toBe('zoom-out');
    expect(press('A')).toBe('approve');
    expect(press('x')).toBe('exclude');
    expect(press('s')).toBe('save');
    expect(press('?')).toBe('help');
    expect(press('Escape')).toBe('escape');
  });

  it('undoes on Ctrl Z or Cmd Z, redoes with Shift, and leaves every other Ctrl key to the browser', () => {
    expect(press('z', { ctrlKey: true })).toBe('undo');
    expect(press('z', { metaKey: true })).toBe('undo');
    expect(press('Z', { ctrlKey: true, shiftKey: true })).toBe('redo');
    expect(press('s', { ctrlKey: true })).toBeNull();
    expect(press('z')).toBeNull();
  });

  it('does nothing for a key it has no use for', () => {
    expect(press('q')).toBeNull();
    expect(press('Enter')).toBeNull();
  });

  it('leaves keys typed into a field to the field', () => {
    for (const tag of ['input', 'textarea', 'select']) {
      const field = document.createElement(tag);
      document.body.append(field);
      const event = new KeyboardEvent('keydown', { key: 's', bubbles: true });
      let action: string | null = 'unread';
      field.addEventListener('keydown', (e) => (action = tuningKeys.actionOf(e)));
      field.dispatchEvent(event);
      field.remove();
      expect(action).toBeNull();
    }
  });

  it('lists every key in the help, the 1:1 view with its way back', () => {
    expect(tuningKeys.help.map((k) => k.keys)).toEqual([
      '← →',
      'B',
      'V',
      'N',
      'F',
      '0',
      '1',
      'Ctrl Z / Ctrl Shift Z',
      'A / X',
      'S',
      '?',
    ]);
    expect(tuningKeys.help.find((k) => k.keys === '1')?.does).toContain('1 or Esc again to fit');
  });
});

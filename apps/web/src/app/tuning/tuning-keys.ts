/** What a key of the tuning screen does. */
export type TuningKeyAction =
  | 'previous-frame'
  | 'next-frame'
  | 'before-after'
  | 'next-view'
  | 'neutral-picker'
  | 'base-region'
  | 'fit'
  | 'zoom-in'
  | 'zoom-out'
  | 'actual-pixels'
  | 'undo'
  | 'redo'
  | 'approve'
  | 'exclude'
  | 'save'
  | 'help'
  | 'escape';

// the keys pressed without Ctrl, by KeyboardEvent.key (letters in lower case)
const plainKeys: Record<string, TuningKeyAction> = {
  ArrowLeft: 'previous-frame',
  ArrowRight: 'next-frame',
  b: 'before-after',
  v: 'next-view',
  n: 'neutral-picker',
  f: 'base-region',
  '0': 'fit',
  '1': 'actual-pixels',
  '+': 'zoom-in',
  '=': 'zoom-in',
  '-': 'zoom-out',
  a: 'approve',
  x: 'exclude',
  s: 'save',
  '?': 'help',
  Escape: 'escape',
};

/** The keys of the tuning screen: what the help panel lists, and which key (or key with Ctrl) does what. */
export const tuningKeys = {
  /** Lines of the help panel. */
  help: [
    { keys: '← →', does: 'Previous or next frame' },
    { keys: 'B', does: 'Show before or after (in toggle view)' },
    { keys: 'V', does: 'Next view: split, side by side, toggle' },
    { keys: 'N', does: 'Neutral picker: drag over an area that should be grey' },
    { keys: 'F', does: 'Draw the film base region' },
    { keys: '0', does: 'Fit the frame; + and − zoom' },
    {
      keys: '1',
      does: 'Actual pixels (1:1) of the saved full-size render at the pointer; 1 or Esc again to fit',
    },
    { keys: 'Ctrl Z / Ctrl Shift Z', does: 'Undo / redo' },
    { keys: 'A / X', does: 'Approve / exclude the frame' },
    { keys: 'S', does: 'Save and render again' },
    { keys: '?', does: 'This help' },
  ] as readonly { keys: string; does: string }[],

  /**
   * The action of a key press, or null when the key does nothing here or is typed into a field.
   * @example tuningKeys.actionOf(new KeyboardEvent('keydown', { key: 'z', ctrlKey: true })) // 'undo'
   */
  actionOf(event: KeyboardEvent): TuningKeyAction | null {
    const tag = (event.target as HTMLElement | null)?.tagName;
    if (tag === 'INPUT' || tag === 'TEXTAREA' || tag === 'SELECT') return null;
    const key = event.key;
    if (event.ctrlKey || event.metaKey)
      return key.toLowerCase() === 'z' ? (event.shiftKey ? 'redo' : 'undo') : null;
    return plainKeys[key.length === 1 ? key.toLowerCase() : key] ?? plainKeys[key] ?? null;
  },
};

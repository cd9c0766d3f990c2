import { statusTone } from './status-tone';

describe('statusTone', () => {
  it('gives each status the tone of its chip', () => {
    expect(statusTone('done')).toBe('good');
    expect(statusTone('failed')).toBe('bad');
    expect(statusTone('inverting')).toBe('working');
    expect(statusTone('running')).toBe('working');
    expect(statusTone('queued')).toBe('');
    expect(statusTone('cancelled')).toBe('');
  });
});

import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { afterTypingPause, typingPauseMs } from './after-typing-pause';

describe('afterTypingPause', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('passes on the text once typing pauses, and not again for the same text', () => {
    TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection()] });
    const applied: string[] = [];
    const typed = TestBed.runInInjectionContext(() => afterTypingPause((t) => applied.push(t)));
    typed('g');
    typed('gl');
    vi.advanceTimersByTime(typingPauseMs - 1);
    expect(applied).toEqual([]);
    typed('gla');
    vi.advanceTimersByTime(typingPauseMs);
    expect(applied).toEqual(['gla']);
    typed('glas');
    typed('gla');
    vi.advanceTimersByTime(typingPauseMs);
    expect(applied).toEqual(['gla']);
  });
});

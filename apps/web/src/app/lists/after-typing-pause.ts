import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { debounceTime, distinctUntilChanged, Subject } from 'rxjs';

// Typing in a search or filter waits this long before asking the server (a common UI pause, our choice).
export const typingPauseMs = 300;

/**
 * A function to call with each keystroke's text: `apply` gets the text once typing pauses, and not again for the
 * same text. Call it in an injection context; it stops when the component is destroyed.
 *
 * @example
 * protected readonly typed = afterTypingPause((text) => this.search.set(text));
 * // template: (input)="typed($any($event.target).value)"
 */
export function afterTypingPause(
  apply: (text: string) => void,
  pauseMs = typingPauseMs,
): (text: string) => void {
  const typed = new Subject<string>();
  typed.pipe(debounceTime(pauseMs), distinctUntilChanged(), takeUntilDestroyed()).subscribe(apply);
  return (text) => typed.next(text);
}

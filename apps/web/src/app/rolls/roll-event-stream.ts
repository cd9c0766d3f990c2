import { InjectionToken, Injectable, inject } from '@angular/core';
import type { RollEvent } from '@clearbase/contracts';
import { Observable, retry, timer } from 'rxjs';

/** Opens an event stream; tests give a fake, the app the browser's EventSource. */
export const EVENT_SOURCE_FACTORY = new InjectionToken<(url: string) => EventSource>('EventSource factory', {
  providedIn: 'root',
  factory: () => (url) => new EventSource(url, { withCredentials: true }),
});

/** What the live stream of a roll tells: it (re)connected, or a job or frame changed. */
export type RollStreamMessage = { type: 'open' } | RollEvent;

// The server asks for 3 s between reconnects (its `retry:` line); we wait as long when the browser gives up.
const reconnectDelayMs = 3000;

const eventTypes = ['job', 'frame'] as const;
// readyState of an EventSource that will not reconnect (HTML Living Standard); not read from the global, which
// test environments lack
const closedState = 2;

/** The live stream of a roll as an Observable around EventSource, reconnecting. */
@Injectable({ providedIn: 'root' })
export class RollEventStream {
  private readonly open = inject(EVENT_SOURCE_FACTORY);

  /**
   * GET /api/rolls/:id/events. Emits `open` on every (re)connection, so the caller can reload what it may have
   * missed. EventSource reconnects by itself after a dropped connection; when it gives up (the server refused the
   * stream), the stream is opened again after a pause. Unsubscribing closes it.
   */
  events(rollId: number): Observable<RollStreamMessage> {
    return new Observable<RollStreamMessage>((subscriber) => {
      const source = this.open(`/api/rolls/${rollId}/events`);
      source.onopen = () => subscriber.next({ type: 'open' });
      source.onerror = () => {
        if (source.readyState === closedState) subscriber.error(new Error('The live stream closed.'));
      };
      const listener = (e: MessageEvent<string>) => {
        try {
          const event = JSON.parse(e.data) as RollEvent;
          if (eventTypes.includes(event.type)) subscriber.next(event);
        } catch {
          // a line we cannot read is skipped; the next reload shows the truth
        }
      };
      for (const t of eventTypes) source.addEventListener(t, listener as EventListener);
      return () => {
        for (const t of eventTypes) source.removeEventListener(t, listener as EventListener);
        source.close();
      };
    }).pipe(retry({ delay: () => timer(reconnectDelayMs) }));
  }
}

import { computed, signal, type Signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { catchError, map, type Observable, of, startWith, switchMap, tap } from 'rxjs';
import { readProblem } from '../problem/read-problem';

/** What a list page shows of its server request: the answer, whether one is on its way, and the refusal. */
export interface ServerList<T> {
  /** The last answer; kept while the next request is on its way, `empty` after a refusal. */
  readonly value: Signal<T>;
  readonly loading: Signal<boolean>;
  /** The server's sentence when it refused, else null. */
  readonly problem: Signal<string | null>;
  /** Asks again with the same request. */
  reload(): void;
}

interface View<T> {
  loading: boolean;
  value: T;
  problem: string | null;
}

/**
 * Loads a list from the server, again whenever `request` changes or `reload()` is called, dropping the answer to
 * a request that has been superseded. Call it in an injection context (a field initialiser).
 *
 * @example
 * private readonly list = serverList({ request: this.filters, load: (f) => this.api.stocks(f), empty: [] });
 * protected readonly loading = this.list.loading;
 */
export function serverList<T>(options: { load: () => Observable<T>; empty: T }): ServerList<T>;
export function serverList<R, T>(options: {
  request: Signal<R>;
  load: (request: R) => Observable<T>;
  empty: T;
}): ServerList<T>;
export function serverList<R, T>(options: {
  request?: Signal<R>;
  load: (request: R) => Observable<T>;
  empty: T;
}): ServerList<T> {
  const { load, empty } = options;
  const request = options.request ?? signal(undefined as R);
  const reloads = signal(0);
  const asked = computed(() => ({ request: request(), reload: reloads() }));
  let last = empty;
  const view: Signal<View<T>> = toSignal(
    toObservable(asked).pipe(
      switchMap(({ request }) =>
        load(request).pipe(
          map((value): View<T> => ({ loading: false, value, problem: null })),
          catchError((err: unknown) =>
            of<View<T>>({ loading: false, value: empty, problem: readProblem(err).message }),
          ),
          startWith<View<T>>({ loading: true, value: last, problem: null }),
        ),
      ),
      tap((v) => (last = v.value)),
    ),
    { initialValue: { loading: true, value: empty, problem: null } },
  );
  return {
    value: computed(() => view().value),
    loading: computed(() => view().loading),
    problem: computed(() => view().problem),
    reload: () => reloads.update((n) => n + 1),
  };
}

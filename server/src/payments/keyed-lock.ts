/** Runs tasks one at a time per key, in the order they were asked for; different keys run side by side. */
export type KeyedLock = <T>(key: string, task: () => Promise<T>) => Promise<T>;

/**
 * A per-key queue inside this process. better-sqlite3 runs each transaction synchronously, so a check and a write in
 * one transaction cannot interleave; but work that waits on the network in between (asking the payment provider)
 * would, and this keeps such work for one payment or one order to one request at a time. A task that fails does not
 * hold up the next.
 *
 * @example
 * const lock = createKeyedLock();
 * await lock(`payment:${id}`, () => refund(id, 500));
 */
export function createKeyedLock(): KeyedLock {
  const tails = new Map<string, Promise<unknown>>();
  return <T>(key: string, task: () => Promise<T>): Promise<T> => {
    const before = tails.get(key) ?? Promise.resolve();
    const run = before.then(task, task);
    const tail = run.catch(() => undefined);
    tails.set(key, tail);
    void tail.then(() => {
      if (tails.get(key) === tail) tails.delete(key);
    });
    return run;
  };
}

/**
 * Runs `task` over `items` with at most `inFlight` running at once, in order of start. With two
 * frames in flight one decodes or encodes (in sharp's threads) while the other is on the pool.
 */
export async function runPipelined<T>(
  items: readonly T[],
  inFlight: number,
  task: (item: T) => Promise<void>,
): Promise<void> {
  let next = 0;
  const lane = async () => {
    while (next < items.length) await task(items[next++]!);
  };
  await Promise.all(Array.from({ length: Math.max(1, Math.min(inFlight, items.length)) }, lane));
}

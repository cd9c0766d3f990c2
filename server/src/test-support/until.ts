/**
 * Polls `what` every 25 ms until it returns something truthy, and returns that; throws after `ms` milliseconds.
 * @example const detail = await until(async () => { const d = await rollOf(id); return d.job.state === 'done' && d; });
 */
export async function until<T>(what: () => Promise<T | undefined | null | false>, ms = 20_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await what();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out after ${ms} ms waiting`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

/** The least a roll may keep decoded between its passes, 256 MB: a budget that suits a small server, from memory. */
export const ROLL_KEEP_FLOOR_BYTES = 256 * 1024 * 1024;
/** Share of the free memory a roll may hold as decoded frames between its passes; from memory. */
export const ROLL_KEEP_SHARE = 0.25;

/**
 * How many bytes of decoded frames a roll may keep from its measuring pass for its inverting pass, given the free
 * memory: a quarter of it, at least ROLL_KEEP_FLOOR_BYTES. A frame that does not fit is decoded again.
 * @example rollKeepBudget(22 * 2 ** 30) // 5.5 GiB: 36 frames of 24 MP (144 MB each) are kept
 */
export function rollKeepBudget(freeBytes: number): number {
  return Math.max(
    ROLL_KEEP_FLOOR_BYTES,
    Math.floor((Number.isFinite(freeBytes) ? freeBytes : 0) * ROLL_KEEP_SHARE),
  );
}

/**
 * Whether one more decoded frame of `frameBytes` may be kept beside `keptBytes` already kept, with `freeBytes` free
 * now: the budget is taken on the memory free before anything was kept (free now + kept), so what the roll holds
 * does not shrink its own budget while other programs' growth does.
 * @example mayKeepFrame(144e6, 0, 22e9) // true
 */
export function mayKeepFrame(frameBytes: number, keptBytes: number, freeBytes: number): boolean {
  return keptBytes + frameBytes <= rollKeepBudget(freeBytes + keptBytes);
}

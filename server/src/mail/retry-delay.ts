// 30 s doubling to at most 1 h, 12 tries (about 7 h in all): common practice for mail retry, from memory
export const firstRetryDelayMs = 30_000;
export const longestRetryDelayMs = 3600_000;
export const maxMailAttempts = 12;

/**
 * How long to wait after the given number of failed attempts before the next one; null when it is time to give up.
 *
 * @example
 * retryDelayMs(1); // 30_000
 * retryDelayMs(3); // 120_000
 */
export function retryDelayMs(failedAttempts: number): number | null {
  if (failedAttempts >= maxMailAttempts) return null;
  return Math.min(firstRetryDelayMs * 2 ** Math.max(0, failedAttempts - 1), longestRetryDelayMs);
}

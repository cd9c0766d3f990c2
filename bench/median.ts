/** Median of a non-empty list of numbers (mean of the middle two for an even count). */
export function median(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError('Expected at least one value for median but received none');
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/**
 * Least-squares non-decreasing fit of a series (isotonic regression) by pool-adjacent-violators: runs that
 * go down are pooled into their weighted mean until the series never decreases. Weights default to 1.
 * Throws a RangeError when weights do not match or are not positive.
 * @example isotonicRegression([1, 3, 2, 4]) // [1, 2.5, 2.5, 4]
 */
export function isotonicRegression(values: readonly number[], weights?: readonly number[]): number[] {
  if (weights && weights.length !== values.length)
    throw new RangeError(`Expected ${values.length} weights but received ${weights.length}`);
  const blocks: { sum: number; weight: number; count: number }[] = [];
  values.forEach((v, i) => {
    const w = weights ? weights[i]! : 1;
    if (!(w > 0))
      throw new RangeError(`Expected number above 0 for weights[${i}] but received ${w} of type number`);
    blocks.push({ sum: v * w, weight: w, count: 1 });
    while (blocks.length > 1) {
      const b = blocks[blocks.length - 1]!,
        a = blocks[blocks.length - 2]!;
      if (a.sum / a.weight <= b.sum / b.weight) break;
      blocks.splice(-2, 2, { sum: a.sum + b.sum, weight: a.weight + b.weight, count: a.count + b.count });
    }
  });
  return blocks.flatMap((b) => Array<number>(b.count).fill(b.sum / b.weight));
}

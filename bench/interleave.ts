import { median } from './median';

export type Timed = () => Promise<unknown>;

/**
 * Runs each case `repetitions` times, interleaved (a b c, b c a, c a b, ...) so drift in machine
 * load touches all cases alike, after one untimed warm-up round unless `warmUp` is false. Returns the median ms per case.
 */
export async function timeInterleaved(
  cases: Record<string, Timed>,
  repetitions: number,
  options: { warmUp?: boolean } = {},
): Promise<Record<string, number>> {
  const samples = await sampleInterleaved(cases, repetitions, options);
  return Object.fromEntries(Object.entries(samples).map(([n, ms]) => [n, median(ms)]));
}

/**
 * As `timeInterleaved`, but every round's ms per case (round k of each case ran within one round of the others, so
 * a ratio of two cases' round k is measured side by side).
 */
export async function sampleInterleaved(
  cases: Record<string, Timed>,
  repetitions: number,
  { warmUp = true }: { warmUp?: boolean } = {},
): Promise<Record<string, number[]>> {
  const names = Object.keys(cases);
  const samples: Record<string, number[]> = Object.fromEntries(names.map((n) => [n, []]));
  if (warmUp) for (const name of names) await cases[name]!();
  for (let rep = 0; rep < repetitions; rep++) {
    for (let k = 0; k < names.length; k++) {
      const name = names[(rep + k) % names.length]!;
      const start = performance.now();
      await cases[name]!();
      samples[name]!.push(performance.now() - start);
    }
  }
  return samples;
}

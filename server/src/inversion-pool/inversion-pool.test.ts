import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createInversionPool, sharedArray, type InversionPool } from './inversion-pool';
import {
  applyInversion,
  compileInversion,
  densityLevels,
  detectFilmBase,
  LINEAR_SCANNER,
  NEUTRAL_STOCK,
  SYNTH_STOCKS,
  synthesizeNegative,
  type InversionParams,
} from './inversion-kernel';

let pool: InversionPool;
beforeAll(() => {
  pool = createInversionPool({ threads: 2, slicesPerThread: 3 });
});
afterAll(async () => {
  await pool.close();
});

function frame(width: number, height: number, output: 'u8' | 'u16', crosstalk?: number[]) {
  const neg = synthesizeNegative({ width, height, stock: SYNTH_STOCKS['tidewater-400']!, seed: 7 });
  const input = sharedArray(Uint16Array, neg.data.length);
  input.set(neg.data);
  const base = detectFilmBase(neg);
  const stock = { ...NEUTRAL_STOCK, ...(crosstalk ? { crosstalk } : {}) };
  const params: Omit<InversionParams, 'levels'> = {
    stock,
    scanner: LINEAR_SCANNER,
    base: base.rgb,
    render: 'print',
    output,
  };
  const levels = densityLevels(
    compileInversion({ ...params, levels: { shadow: [0, 0, 0], highlight: [1, 1, 1] } }),
    neg.data,
  );
  return { neg, input, plan: compileInversion({ ...params, levels }) };
}

describe('inversion pool', () => {
  for (const output of ['u8', 'u16'] as const) {
    it(`gives exactly the single-thread result (${output} output)`, async () => {
      const { neg, input, plan } = frame(
        331,
        217,
        output,
        [1.05, -0.03, -0.02, -0.04, 1.06, -0.02, -0.01, -0.05, 1.06],
      );
      const kind = output === 'u8' ? Uint8Array : Uint16Array;
      const single = new kind(neg.data.length);
      applyInversion(plan, neg.data, single, 0, neg.width * neg.height);
      const pooled = sharedArray(kind, neg.data.length);
      await pool.invertFrame(plan, input, pooled, neg.width, neg.height);
      expect(Buffer.from(pooled.buffer).equals(Buffer.from(single.buffer))).toBe(true);
    });
  }

  it('handles frames with fewer rows than slices', async () => {
    const { neg, input, plan } = frame(50, 3, 'u8');
    const single = new Uint8Array(neg.data.length);
    applyInversion(plan, neg.data, single, 0, neg.width * neg.height);
    const pooled = sharedArray(Uint8Array, neg.data.length);
    await pool.invertFrame(plan, input, pooled, neg.width, neg.height);
    expect(Array.from(pooled)).toEqual(Array.from(single));
  });

  it('refuses buffers that are not shared', async () => {
    const { neg, plan } = frame(20, 10, 'u8');
    await expect(pool.invertFrame(plan, neg.data, new Uint8Array(neg.data.length), 20, 10)).rejects.toThrow(
      'Expected input and output backed by a SharedArrayBuffer',
    );
  });

  it('validates its size with a message of the usual shape', () => {
    expect(() => createInversionPool({ threads: 0 })).toThrow(
      'Expected integer between 1 and 256 for threads but received 0 of type number',
    );
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createInversionPool, sharedArray, type InversionPool } from './inversion-pool';
import {
  applyInversion,
  compileInversion,
  exposeNegative,
  LINEAR_SCANNER,
  measureFrameLevels,
  outdoorScene,
  profileForStock,
  TINTLINE_400,
  type Matrix3,
} from '@clearbase/inversion';

let pool: InversionPool;
beforeAll(() => {
  pool = createInversionPool({ threads: 2, slicesPerThread: 3 });
});
afterAll(async () => {
  await pool.close();
});

function frame(width: number, height: number, output: 'u8' | 'u16', crosstalk?: Matrix3, saturation = 1.2) {
  const neg = exposeNegative(outdoorScene(width, height), {
    stock: TINTLINE_400,
    scanner: LINEAR_SCANNER,
    grain: 0.01,
    seed: 7,
    rebate: 2,
  });
  const input = sharedArray(Uint16Array, neg.data.length);
  input.set(neg.data);
  const stock = profileForStock(TINTLINE_400);
  const profile = { ...stock, saturation, ...(crosstalk ? { crosstalk } : {}) };
  const params = {
    profile,
    scanner: LINEAR_SCANNER,
    base: neg.truth.base,
    render: 'print' as const,
    outputBits: output === 'u8' ? (8 as const) : (16 as const),
  };
  const levels = measureFrameLevels(params, neg);
  return { neg, input, plan: compileInversion({ ...params, midLogExposure: levels.midLogExposure }) };
}

describe('inversion pool', () => {
  it('gives exactly the single-thread result through the nearest-code table (u8, saturation 1)', async () => {
    const { neg, input, plan } = frame(301, 199, 'u8', undefined, 1);
    expect(plan.codeLut).toBeTruthy();
    const single = new Uint8Array(neg.data.length);
    applyInversion(plan, neg.data, single, 0, neg.width * neg.height);
    const pooled = sharedArray(Uint8Array, neg.data.length);
    await pool.invertFrame(plan, input, pooled, neg.width, neg.height);
    expect(Buffer.from(pooled.buffer).equals(Buffer.from(single.buffer))).toBe(true);
  });
  for (const output of ['u8', 'u16'] as const) {
    it(`gives exactly the single-thread result (${output} output)`, async () => {
      const { neg, input, plan } = frame(331, 217, output, [
        [1.05, -0.03, -0.02],
        [-0.04, 1.06, -0.02],
        [-0.01, -0.05, 1.06],
      ]);
      const kind = output === 'u8' ? Uint8Array : Uint16Array;
      const single = new kind(neg.data.length);
      applyInversion(plan, neg.data, single, 0, neg.width * neg.height);
      const pooled = sharedArray(kind, neg.data.length);
      await pool.invertFrame(plan, input, pooled, neg.width, neg.height);
      expect(Buffer.from(pooled.buffer).equals(Buffer.from(single.buffer))).toBe(true);
    });
  }

  it('reports each band once as it is written, with exactly the single-thread result', async () => {
    const { neg, input, plan } = frame(97, 61, 'u8');
    const single = new Uint8Array(neg.data.length);
    applyInversion(plan, neg.data, single, 0, neg.width * neg.height);
    const pooled = sharedArray(Uint8Array, neg.data.length);
    const seen: number[] = [];
    const rowBytes = neg.width * 3;
    await pool.invertFrame(plan, input, pooled, neg.width, neg.height, {
      rows: 16,
      done: (k) => {
        // The band is whole when reported.
        const band = (a: Uint8Array) => Buffer.from(a.subarray(k * 16 * rowBytes, (k + 1) * 16 * rowBytes));
        expect(band(pooled).equals(band(single))).toBe(true);
        seen.push(k);
      },
    });
    expect(seen.sort((a, b) => a - b)).toEqual(
      Array.from({ length: Math.ceil(neg.height / 16) }, (_, k) => k),
    );
    expect(Buffer.from(pooled.buffer).equals(Buffer.from(single.buffer))).toBe(true);
  });

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

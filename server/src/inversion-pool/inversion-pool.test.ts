import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createInversionPool, sharedArray, type FrameBands, type InversionPool } from './inversion-pool';
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

type Frame = ReturnType<typeof frame>;
const kindOf = (output: 'u8' | 'u16') => (output === 'u8' ? Uint8Array : Uint16Array);

/** The frame inverted on the calling thread. */
function singleThread({ neg, plan }: Frame, output: 'u8' | 'u16'): Uint8Array | Uint16Array {
  const out = new (kindOf(output))(neg.data.length);
  applyInversion(plan, neg.data, out, 0, neg.width * neg.height);
  return out;
}

/** The frame inverted on the pool into `out`, band by band with `bands`. */
async function onPool(
  { neg, input, plan }: Frame,
  output: 'u8' | 'u16',
  bands?: FrameBands,
  out = sharedArray(kindOf(output), neg.data.length),
) {
  await pool.invertFrame(plan, input, out, neg.width, neg.height, bands);
  return out;
}

const bytes = (a: Uint8Array | Uint16Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

describe('inversion pool', () => {
  const crosstalk: Matrix3 = [
    [1.05, -0.03, -0.02],
    [-0.04, 1.06, -0.02],
    [-0.01, -0.05, 1.06],
  ];
  const cases = [
    ['through the nearest-code table (u8, saturation 1)', () => frame(301, 199, 'u8', undefined, 1), 'u8'],
    ['(u8 output)', () => frame(331, 217, 'u8', crosstalk), 'u8'],
    ['(u16 output)', () => frame(331, 217, 'u16', crosstalk), 'u16'],
    ['for a frame with fewer rows than slices', () => frame(50, 3, 'u8'), 'u8'],
  ] as const;
  for (const [name, make, output] of cases) {
    it(`gives exactly the single-thread result ${name}`, async () => {
      const f = make();
      if (name.includes('nearest-code')) expect(f.plan.codeLut).toBeTruthy();
      expect(bytes(await onPool(f, output)).equals(bytes(singleThread(f, output)))).toBe(true);
    });
  }

  it('reports each band once as it is written, with exactly the single-thread result', async () => {
    const f = frame(97, 61, 'u8');
    const single = bytes(singleThread(f, 'u8'));
    const seen: number[] = [];
    const rowBytes = f.neg.width * 3;
    const band = (a: Buffer, k: number) => a.subarray(k * 16 * rowBytes, (k + 1) * 16 * rowBytes);
    const out = sharedArray(Uint8Array, f.neg.data.length);
    const pooled = bytes(out);
    await onPool(
      f,
      'u8',
      {
        rows: 16,
        done: (k) => {
          // The band is whole when reported.
          expect(band(pooled, k).equals(band(single, k))).toBe(true);
          seen.push(k);
        },
      },
      out,
    );
    expect(seen.sort((a, b) => a - b)).toEqual(
      Array.from({ length: Math.ceil(f.neg.height / 16) }, (_, k) => k),
    );
    expect(pooled.equals(single)).toBe(true);
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

import { describe, expect, it } from 'vitest';
import { sharePlan } from './share-plan';

describe('sharePlan', () => {
  it('moves nested typed arrays onto shared memory and keeps everything else', () => {
    const plan = {
      output: 'u8',
      scale: 2.5,
      lut: new Float32Array([1, 2, 3]),
      nested: { table: new Uint16Array([7]), none: null },
      list: [new Uint8Array([4])],
    };
    const shared = sharePlan(plan);
    expect(shared.lut.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(shared.nested.table.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(shared.list[0]!.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(Array.from(shared.lut)).toEqual([1, 2, 3]);
    expect(shared).toMatchObject({ output: 'u8', scale: 2.5, nested: { none: null } });
    expect(plan.lut.buffer).toBeInstanceOf(ArrayBuffer);
  });
});

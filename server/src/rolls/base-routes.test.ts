import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';
import { addTestLab } from '../test-support/test-lab';

let t: TestApp;
let operator: Client;
let roll: number;
let frame: number;

beforeAll(async () => {
  t = await createTestApp();
  const { customerId, stockId, ...lab } = await addTestLab(t);
  operator = lab.operator;
  let frames: number[];
  ({ roll, frames } = await addRollWithScans(operator, {
    customerId,
    stockId,
    scans: [{ name: 'a.tif', seed: 1 }],
  }));
  frame = frames[0]!;
});
afterAll(() => t.close());

// the test negatives have a rebate of unexposed film along the top 4 rows (synth-command's 6 %, at least 4 px)
const rebate = { x: 8, y: 0, width: 20, height: 3 };

describe('roll base by hand', () => {
  it('sets a roll base from a rectangle on one of its frames, and refuses a frame of another roll', async () => {
    const res = await operator.send('put', `/api/rolls/${roll}/base`, {
      mode: 'region',
      frameId: frame,
      region: rebate,
    });
    expect(res.status).toBe(200);
    expect(res.body.base).toMatchObject({ mode: 'region', frameId: frame, region: rebate });
    expect(res.body.base.measured.rgb.every((v: number) => v > 0 && v <= 1)).toBe(true);
    const wrong = await operator.send('put', `/api/rolls/${roll}/base`, {
      mode: 'region',
      frameId: frame + 100,
      region: rebate,
    });
    expect(wrong.status).toBe(404);
    const auto = await operator.send('put', `/api/rolls/${roll}/base`, { mode: 'auto' });
    expect(auto.body.base).toMatchObject({ mode: 'auto', frameId: null, region: null });
    expect(auto.body.base.measured.confidence).toBeGreaterThan(0);
  });
});

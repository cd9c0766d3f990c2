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

describe('film base by hand', () => {
  it('refuses a rectangle past the edge of the scan, naming the field', async () => {
    const res = await operator.send('put', `/api/frames/${frame}/base`, {
      mode: 'region',
      region: { x: 90, y: 0, width: 10, height: 3 },
    });
    expect(res.status).toBe(422);
    expect(res.body.errors).toEqual([
      { path: 'body.region.width', message: "x + width is 100, past the scan's width of 96 pixels" },
    ]);
  });

  it('samples a frame’s base in a drawn rectangle, and goes back to automatic', async () => {
    const drawn = await operator.send('put', `/api/frames/${frame}/base`, { mode: 'region', region: rebate });
    expect(drawn.status).toBe(200);
    expect(drawn.body.base).toMatchObject({ mode: 'region', region: rebate });
    expect(drawn.body.base.measured.confidence).toBeGreaterThan(0);
    const auto = await operator.send('put', `/api/frames/${frame}/base`, { mode: 'auto' });
    expect(auto.body.base).toMatchObject({ mode: 'auto', region: null });
    const audit = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('action', '=', 'frame-base-changed')
      .execute();
    expect(audit).toHaveLength(2);
  });

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

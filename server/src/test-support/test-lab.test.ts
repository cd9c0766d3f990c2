import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestLab, type TestLab } from './test-lab';
import { createTestApp, type TestApp } from './test-app';

let t: TestApp;
let lab: TestLab;
beforeAll(async () => {
  t = await createTestApp();
  lab = await addTestLab(t);
});
afterAll(() => t.close());

describe('the test lab', () => {
  it('opens an order of one roll of the published stock for the customer, with no scanner unless asked', async () => {
    const { order, roll } = await lab.newRoll();
    const { body } = await lab.operator.get(`/api/rolls/${roll}`).expect(200);
    expect(body.roll).toMatchObject({ orderId: order, stockId: lab.stockId, scannerId: null });
    const read = await lab.newRoll({ scannerId: lab.scannerId });
    const scanned = await lab.operator.get(`/api/rolls/${read.roll}`).expect(200);
    expect(scanned.body.roll.scannerId).toBe(lab.scannerId);
    expect(read.order).not.toBe(order);
  });
});

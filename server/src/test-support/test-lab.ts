import { LINEAR_SCANNER } from '@clearbase/inversion';
import { addOrderTestLab } from '../orders/order-test-fixtures';
import { insertScanner } from '../scanners/scanner-repository';
import type { Client, TestApp } from './test-app';

const at = new Date('2026-03-01T08:00:00Z');

/** The lab a roll test works in; see `addTestLab`. */
export interface TestLab {
  /** The customer cass@lab.test. */
  customerId: number;
  /** The operator oskar@lab.test, signed in. */
  operator: Client;
  /** A stock with a published profile. */
  stockId: number;
  /** The published version of that stock's profile. */
  versionId: number;
  /** A stock whose only profile is a draft. */
  unpublishedStockId: number;
  /** A camera rig reading linearly, as the inversion assumes when a roll names no scanner. */
  scannerId: number;
  /**
   * A new order for the customer holding one empty roll (135-36 at EI 200) of the published stock, read by
   * `scannerId` when given; returns both ids.
   */
  newRoll(options?: { scannerId?: number }): Promise<{ order: number; roll: number }>;
}

/**
 * A customer, a signed-in operator, the test catalogue (a stock with a published profile, one with a draft only)
 * and a scanner, with a way to open an order of one roll.
 * @example const lab = await addTestLab(t); const { roll } = await lab.newRoll();
 */
export async function addTestLab(t: TestApp): Promise<TestLab> {
  const lab = await addOrderTestLab(t);
  const scanner = await insertScanner(
    t.db,
    { name: 'Test rig', kind: 'camera-rig', inputProfile: { ...LINEAR_SCANNER, name: 'Test rig' } },
    at,
  );
  const { operator, customerId, stockId } = lab;
  return {
    ...lab,
    scannerId: scanner.id,
    async newRoll(options = {}) {
      const order = (await operator.post('/api/orders', { customerId }).expect(201)).body.id as number;
      const scannerId = options.scannerId === undefined ? {} : { scannerId: options.scannerId };
      const roll = (
        await operator
          .post(`/api/orders/${order}/rolls`, { stockId, ei: 200, format: '135-36', ...scannerId })
          .expect(201)
      ).body.id as number;
      return { order, roll };
    },
  };
}

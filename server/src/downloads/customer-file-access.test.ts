import { describe, expect, it } from 'vitest';
import { customerFileAccess, type FileReleaseState } from './customer-file-access';

const paidReady: FileReleaseState = {
  orderId: 7,
  status: 'ready',
  dueMinor: 0,
  currency: 'EUR',
  payOnCollection: false,
};

describe('customerFileAccess', () => {
  it('releases full-size files and previews of approved frames once the order is ready and paid in full', () => {
    expect(customerFileAccess(paidReady, 'approved', 'full-size')).toEqual({ allowed: true });
    expect(customerFileAccess(paidReady, 'approved', 'preview')).toEqual({ allowed: true });
    expect(customerFileAccess({ ...paidReady, status: 'delivered' }, 'approved', 'full-size')).toEqual({
      allowed: true,
    });
  });

  it('keeps full-size files of an unpaid order in scanning, naming why, but shows approved thumbnails', () => {
    const scanning = { ...paidReady, status: 'scanning' as const, dueMinor: 2000 };
    expect(customerFileAccess(scanning, 'approved', 'full-size')).toEqual({
      allowed: false,
      refusal: 'not-released',
      reason: 'Order 7 is scanning; its full-size scans come once the lab marks it ready.',
    });
    expect(customerFileAccess(scanning, 'approved', 'preview')).toMatchObject({ allowed: false });
    expect(customerFileAccess(scanning, 'approved', 'thumbnail')).toEqual({ allowed: true });
  });

  it('keeps a ready order’s files until the balance is paid, and says how much is left', () => {
    expect(customerFileAccess({ ...paidReady, dueMinor: 14500 }, 'approved', 'full-size')).toEqual({
      allowed: false,
      refusal: 'not-released',
      reason: 'Order 7 has €145.00 left to pay; its full-size scans come once it is paid in full.',
    });
  });

  it('keeps the files of an order the price list cannot price', () => {
    expect(customerFileAccess({ ...paidReady, dueMinor: null }, 'approved', 'full-size')).toMatchObject({
      allowed: false,
      refusal: 'not-released',
    });
  });

  it('releases a ready order unpaid where the lab takes payment on collection, but not one still in work', () => {
    const collect = { ...paidReady, dueMinor: 2000, payOnCollection: true };
    expect(customerFileAccess(collect, 'approved', 'full-size')).toEqual({ allowed: true });
    expect(customerFileAccess({ ...collect, status: 'tuning' }, 'approved', 'full-size')).toMatchObject({
      allowed: false,
      refusal: 'not-released',
    });
  });

  it('never serves an excluded, rejected or unreviewed frame, not even as a thumbnail', () => {
    for (const decision of ['excluded', 'rejected', null] as const) {
      for (const kind of ['thumbnail', 'preview', 'full-size'] as const) {
        expect(customerFileAccess(paidReady, decision, kind)).toMatchObject({
          allowed: false,
          refusal: 'hidden',
        });
      }
    }
  });

  it('releases nothing full-size of a cancelled order', () => {
    expect(customerFileAccess({ ...paidReady, status: 'cancelled' }, 'approved', 'full-size')).toMatchObject({
      allowed: false,
    });
  });
});

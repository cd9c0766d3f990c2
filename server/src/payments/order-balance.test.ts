import { describe, expect, it } from 'vitest';
import { orderBalance, surplusOf } from './order-balance';

const price = { totalMinor: 16500, currency: 'EUR' };

describe('orderBalance', () => {
  it('owes the difference when rolls were added after paying', () => {
    expect(orderBalance(price, [{ amountMinor: 2000, status: 'paid', surplusRefundedMinor: 0 }])).toEqual({
      currency: 'EUR',
      priceMinor: 16500,
      paidMinor: 2000,
      dueMinor: 14500,
    });
  });

  it('counts only payments the provider took, not open or declined checkouts', () => {
    const balance = orderBalance(price, [
      { amountMinor: 16500, status: 'open', surplusRefundedMinor: 0 },
      { amountMinor: 16500, status: 'declined', surplusRefundedMinor: 0 },
    ]);
    expect(balance).toMatchObject({ paidMinor: 0, dueMinor: 16500 });
  });

  it('keeps an order paid after a refund the lab granted, and never owes less than nothing', () => {
    const balance = orderBalance(price, [
      { amountMinor: 16500, status: 'partly-refunded', surplusRefundedMinor: 0 },
      { amountMinor: 1000, status: 'paid', surplusRefundedMinor: 0 },
    ]);
    expect(balance).toMatchObject({ paidMinor: 17500, dueMinor: 0 });
  });

  it('counts a second payment refunded as surplus for nothing', () => {
    const balance = orderBalance(price, [
      { amountMinor: 16500, status: 'paid', surplusRefundedMinor: 0 },
      { amountMinor: 16500, status: 'refunded', surplusRefundedMinor: 16500 },
    ]);
    expect(balance).toMatchObject({ paidMinor: 16500, dueMinor: 0 });
  });

  it('knows nothing due for an order the price list cannot price', () => {
    expect(orderBalance({ totalMinor: null, currency: 'EUR' }, [])).toEqual({
      currency: 'EUR',
      priceMinor: null,
      paidMinor: 0,
      dueMinor: null,
    });
  });
});

describe('surplusOf', () => {
  it('is the whole of a second payment for an order already paid', () => {
    expect(surplusOf({ currency: 'EUR', priceMinor: 2000, paidMinor: 4000, dueMinor: 0 }, 2000)).toBe(2000);
  });

  it('is the part past the price of a payment that overpays, and nothing of one that does not', () => {
    expect(surplusOf({ currency: 'EUR', priceMinor: 2500, paidMinor: 4000, dueMinor: 0 }, 2000)).toBe(1500);
    expect(surplusOf({ currency: 'EUR', priceMinor: 4000, paidMinor: 4000, dueMinor: 0 }, 2000)).toBe(0);
    expect(surplusOf({ currency: 'EUR', priceMinor: null, paidMinor: 4000, dueMinor: null }, 2000)).toBe(0);
  });
});

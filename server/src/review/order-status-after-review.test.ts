import { describe, expect, it } from 'vitest';
import { orderStatusAfterReview } from './order-status-after-review';

describe('order status after a review', () => {
  it('readies an order in work once every roll is approved', () => {
    expect(orderStatusAfterReview('tuning', true)).toBe('ready');
    expect(orderStatusAfterReview('scanning', true)).toBe('ready');
    expect(orderStatusAfterReview('developing', true)).toBe('ready');
  });

  it('takes a ready order back to tuning when a roll is no longer approved', () => {
    expect(orderStatusAfterReview('ready', false)).toBe('tuning');
  });

  it('leaves alone an order that is received, delivered, cancelled or already where it belongs', () => {
    expect(orderStatusAfterReview('received', true)).toBeNull();
    expect(orderStatusAfterReview('delivered', true)).toBeNull();
    expect(orderStatusAfterReview('cancelled', false)).toBeNull();
    expect(orderStatusAfterReview('ready', true)).toBeNull();
    expect(orderStatusAfterReview('tuning', false)).toBeNull();
  });
});

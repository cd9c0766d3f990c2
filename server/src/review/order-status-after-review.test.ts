import { describe, expect, it } from 'vitest';
import { orderStatusAfterReview } from './order-status-after-review';

describe('order status after a review', () => {
  it('readies an order in work once every roll is approved and payment lets it', () => {
    expect(orderStatusAfterReview('tuning', true, true)).toBe('ready');
    expect(orderStatusAfterReview('scanning', true, true)).toBe('ready');
    expect(orderStatusAfterReview('developing', true, true)).toBe('ready');
  });

  it('keeps an approved order that is not paid where it is, as marking it ready would', () => {
    expect(orderStatusAfterReview('tuning', true, false)).toBeNull();
  });

  it('takes a ready order back to tuning when a roll is no longer approved', () => {
    expect(orderStatusAfterReview('ready', false, true)).toBe('tuning');
  });

  it('leaves alone an order that is received, delivered, cancelled or already where it belongs', () => {
    expect(orderStatusAfterReview('received', true, true)).toBeNull();
    expect(orderStatusAfterReview('delivered', true, true)).toBeNull();
    expect(orderStatusAfterReview('cancelled', false, true)).toBeNull();
    expect(orderStatusAfterReview('ready', true, true)).toBeNull();
    expect(orderStatusAfterReview('tuning', false, true)).toBeNull();
  });
});

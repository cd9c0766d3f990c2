import { describe, expect, it } from 'vitest';
import { refusalOfStaffMove } from './order-status';

describe('what staff may set by hand', () => {
  it('moves freely among the working statuses and cancels any open order', () => {
    expect(refusalOfStaffMove(7, 'tuning', 'scanning')).toBeNull();
    expect(refusalOfStaffMove(7, 'received', 'developing')).toBeNull();
    expect(refusalOfStaffMove(7, 'ready', 'tuning')).toBeNull();
    expect(refusalOfStaffMove(7, 'scanning', 'cancelled')).toBeNull();
  });

  it('keeps a closed order closed', () => {
    expect(refusalOfStaffMove(7, 'delivered', 'tuning')).toMatchObject({
      status: 409,
      code: 'order-closed',
      message: 'Order 7 is delivered and cannot change status any more.',
    });
    expect(refusalOfStaffMove(7, 'cancelled', 'received')?.code).toBe('order-closed');
  });

  it('sends ready through marking ready, which checks the rolls and the money and mails the customer', () => {
    expect(refusalOfStaffMove(7, 'tuning', 'ready')).toMatchObject({
      status: 409,
      code: 'mark-ready-instead',
    });
  });

  it('hands over only a ready order', () => {
    expect(refusalOfStaffMove(7, 'tuning', 'delivered')).toMatchObject({
      status: 409,
      code: 'order-not-ready',
      message: 'Order 7 is tuning; only a ready order can be delivered. Mark it ready first.',
    });
    expect(refusalOfStaffMove(7, 'ready', 'delivered')).toBeNull();
  });
});

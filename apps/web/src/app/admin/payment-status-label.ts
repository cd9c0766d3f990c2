import type { PaymentStatus } from '@clearbase/contracts';

const labels: Record<PaymentStatus, string> = {
  open: 'Waiting for payment',
  paid: 'Paid',
  declined: 'Declined',
  refunded: 'Refunded',
  'partly-refunded': 'Partly refunded',
};

/** A payment's status in words, e.g. `partly-refunded` → "Partly refunded". */
export const paymentStatusLabel = (status: PaymentStatus) => labels[status];

/** Paid payments with something left to give back. */
export const refundable = (status: PaymentStatus) => status === 'paid' || status === 'partly-refunded';

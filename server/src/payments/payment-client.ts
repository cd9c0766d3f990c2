import Stripe from 'stripe';
import type { PaymentSettings } from '../config/config';

/** The provider's SDK client as this app uses it. */
export type PaymentClient = Stripe;

// 2 retries with the SDK's own back-off, 20 s per request: the SDK's documented knobs, values our choice
const maxNetworkRetries = 2;
const requestTimeoutMs = 20_000;

/**
 * The provider's official SDK pointed at PAYMENT_API_BASE (the hosted API, or the local fake): switching between
 * them is configuration only.
 *
 * @example
 * const payments = createPaymentClient({ ...config.payment, apiBase: 'http://127.0.0.1:4311' });
 * await payments.checkout.sessions.create({ ... });
 */
export function createPaymentClient(settings: PaymentSettings): PaymentClient {
  if (!settings.apiBase) throw new Error('The payment provider address is not known yet (PAYMENT_API_BASE).');
  const base = new URL(settings.apiBase);
  const protocol = base.protocol === 'http:' ? 'http' : 'https';
  return new Stripe(settings.secretKey, {
    host: base.hostname,
    port: base.port || (protocol === 'http' ? 80 : 443),
    protocol,
    maxNetworkRetries,
    timeout: requestTimeoutMs,
    telemetry: false,
  });
}

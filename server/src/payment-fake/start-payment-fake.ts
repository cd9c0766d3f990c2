import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { createPaymentFakeApp, type PaymentFake, type PaymentFakeOptions } from './payment-fake-app';

export interface RunningPaymentFake extends PaymentFake {
  /** http://host:port of the fake's API and checkout pages. */
  url: string;
  stop(): Promise<void>;
}

/**
 * Starts the payment fake on its own port (0 for any free one).
 *
 * @example
 * const fake = await startPaymentFake({ secretKey, webhookSecret, webhookUrl, logger, port: 0 });
 * const stripe = new Stripe(secretKey, { host: '127.0.0.1', port: new URL(fake.url).port, protocol: 'http' });
 */
export async function startPaymentFake(
  options: Omit<PaymentFakeOptions, 'publicBase'> & { host?: string; port?: number },
): Promise<RunningPaymentFake> {
  const host = options.host ?? '127.0.0.1';
  let url = '';
  const fake = createPaymentFakeApp({ ...options, publicBase: () => url });
  const server: Server = await new Promise((resolve, reject) => {
    const s = fake.app.listen(options.port ?? 0, host, () => resolve(s));
    s.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  url = `http://${host === '0.0.0.0' ? '127.0.0.1' : host}:${port}`;
  return {
    ...fake,
    url,
    stop: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

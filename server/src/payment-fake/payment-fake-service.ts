import type { Logger } from 'pino';
import type { BackgroundService } from '../background-service';
import type { Config } from '../config/config';
import { paymentWebhookPath } from '../payments/raw-body';
import { startPaymentFake, type RunningPaymentFake } from './start-payment-fake';

/**
 * The payment fake as main.ts runs it: only with local fakes and no PAYMENT_API_BASE of its own. Once listening it
 * fills in `config.payment.apiBase` with its address (the one setting not known before start), so the SDK client the
 * app makes on first use talks to it; events go to this server's webhook at PUBLIC_URL.
 *
 * @example
 * services.push(...paymentFakeServices(config, logger));
 */
export function paymentFakeServices(config: Config, logger: Logger): BackgroundService[] {
  if (!config.localFakes || config.payment.apiBase) return [];
  let fake: RunningPaymentFake | undefined;
  return [
    {
      name: 'payment fake',
      async start() {
        fake = await startPaymentFake({
          secretKey: config.payment.secretKey,
          webhookSecret: config.payment.webhookSecret,
          webhookUrl: `${config.publicUrl}${paymentWebhookPath}`,
          logger: logger.child({ service: 'payment-fake' }),
          host: config.host,
          port: config.payment.fakePort,
        });
        config.payment.apiBase = fake.url;
        logger.info({ url: fake.url }, 'local payment fake listening');
      },
      async stop() {
        await fake?.stop();
      },
    },
  ];
}

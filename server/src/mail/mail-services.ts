import type { Kysely } from 'kysely';
import type { Logger } from 'pino';
import type { BackgroundService } from '../background-service';
import type { Clock } from '../clock';
import type { Config } from '../config/config';
import type { Database } from '../db/database';
import { caughtMailFolder } from '../dev-mailbox/caught-mail-store';
import { startMailCatcher, type MailCatcher } from '../dev-mailbox/mail-catcher';
import { smtpTransport } from './mail-transport';
import { createOutboxSender, type OutboxSender } from './outbox-sender';

/**
 * What main.ts starts for e-mail: with local fakes, the mail catcher (on SMTP_PORT, or any free port for 0), then the
 * outbox sender pointed at it; otherwise the sender alone, pointed at the configured mail server.
 *
 * @example
 * services.push(...mailServices(config, { db, clock: systemClock, logger }));
 */
export function mailServices(
  config: Config,
  deps: { db: Kysely<Database>; clock: Clock; logger: Logger },
): BackgroundService[] {
  let catcher: MailCatcher | undefined;
  let sender: OutboxSender | undefined;
  const services: BackgroundService[] = [];
  if (config.localFakes) {
    services.push({
      name: 'mail catcher',
      async start() {
        catcher = await startMailCatcher({
          folder: caughtMailFolder(config.dataDir),
          logger: deps.logger,
          port: config.smtp.port,
        });
        deps.logger.info({ port: catcher.port }, 'local mail catcher listening');
      },
      async stop() {
        await catcher?.stop();
      },
    });
  }
  services.push({
    name: 'outbox sender',
    start() {
      const smtp = catcher ? { ...config.smtp, host: '127.0.0.1', port: catcher.port } : config.smtp;
      sender = createOutboxSender({
        ...deps,
        transport: smtpTransport(smtp),
        fromAddress: config.smtp.from,
        messageIdHost: new URL(config.publicUrl).hostname,
      });
      sender.start();
    },
    async stop() {
      await sender?.stop();
    },
  });
  return services;
}

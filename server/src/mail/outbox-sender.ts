import type { Kysely } from 'kysely';
import type { Logger } from 'pino';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { readLab } from '../lab/lab-settings';
import type { MailTransport } from './mail-transport';
import { findDueMail, markMailAttemptFailed, markMailSent } from './outbox-repository';
import { retryDelayMs } from './retry-delay';

// a few seconds between looks at the outbox keeps mail prompt at almost no cost (our choice)
const defaultPollMs = 2000;
// 20 per pass: one slow server cannot hold up the process for long (our choice)
const batchSize = 20;

export interface OutboxSenderOptions {
  db: Kysely<Database>;
  clock: Clock;
  logger: Logger;
  transport: MailTransport;
  /** The sender address; the lab's name is shown with it. */
  fromAddress: string;
  /** Host part of the Message-ID of each message. */
  messageIdHost: string;
  pollMs?: number;
}

export interface OutboxSender {
  /** Tries every due message once; resolves with how many were delivered. Never runs two passes at once. */
  runOnce(): Promise<number>;
  start(): void;
  stop(): Promise<void>;
}

function displayName(name: string): string {
  return `"${name.replace(/["\\\r\n]/g, '')}"`;
}

/**
 * Delivers the outbox. A row changes to `sent` only after the mail server accepted the message, so a crash at any
 * point loses nothing: at worst a message accepted just before the crash goes out twice, with the same Message-ID.
 * A failure leaves the row pending with the next attempt pushed back (30 s doubling to 1 h), and after 12 attempts
 * marks it `failed` for a person to look at.
 *
 * @example
 * const sender = createOutboxSender({ db, clock, logger, transport: smtpTransport(config.smtp), ... });
 * sender.start();
 */
export function createOutboxSender(options: OutboxSenderOptions): OutboxSender {
  const { db, clock, logger, transport } = options;
  let running: Promise<number> | null = null;
  let timer: NodeJS.Timeout | undefined;

  async function pass(): Promise<number> {
    const due = await findDueMail(db, clock.now(), batchSize);
    if (!due.length) return 0;
    const lab = await readLab(db);
    const from = `${displayName(lab.name)} <${options.fromAddress}>`;
    let delivered = 0;
    for (const row of due) {
      const attempts = row.attempts + 1;
      try {
        await transport.send({
          from,
          to: row.to_address,
          subject: row.subject,
          text: row.text_body,
          html: row.html_body,
          messageId: `<outbox-${row.id}-${row.created_at.replace(/\D/g, '')}@${options.messageIdHost}>`,
        });
      } catch (err) {
        const error = err instanceof Error ? err.message : String(err);
        const delay = retryDelayMs(attempts);
        const nextAttemptAt = delay === null ? null : new Date(clock.now().getTime() + delay);
        await markMailAttemptFailed(db, row.id, { attempts, error, nextAttemptAt });
        logger.warn(
          { outboxId: row.id, kind: row.kind, attempts, error, nextAttemptAt },
          delay === null ? 'gave up sending an e-mail' : 'sending an e-mail failed; will retry',
        );
        continue;
      }
      await markMailSent(db, row.id, attempts, clock.now());
      delivered += 1;
      logger.info({ outboxId: row.id, kind: row.kind }, 'e-mail sent');
    }
    return delivered;
  }

  function runOnce(): Promise<number> {
    running ??= pass().finally(() => {
      running = null;
    });
    return running;
  }

  return {
    runOnce,
    start() {
      timer = setInterval(() => {
        runOnce().catch((err: unknown) => logger.error({ err }, 'the outbox pass failed'));
      }, options.pollMs ?? defaultPollMs);
      timer.unref();
    },
    async stop() {
      clearInterval(timer);
      await running?.catch(() => undefined);
      transport.close();
    },
  };
}

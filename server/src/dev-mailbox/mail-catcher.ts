import { simpleParser, type AddressObject } from 'mailparser';
import { randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import type { Logger } from 'pino';
import { SMTPServer } from 'smtp-server';
import { saveCaughtMail } from './caught-mail-store';
import { sanitiseMailHtml } from './sanitise-mail-html';

export interface MailCatcher {
  /** The port it listens on (the one asked for, or the free one it got for 0). */
  port: number;
  stop(): Promise<void>;
}

export interface MailCatcherOptions {
  folder: string;
  logger: Logger;
  host?: string;
  /** 0 for any free port. */
  port?: number;
  /** The time stamp of caught mail; the system clock by default. */
  now?: () => Date;
}

// 25 MB: a message far larger than any the product writes (our choice)
const maxMessageBytes = 25 * 1024 * 1024;

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
  const list = value === undefined ? [] : Array.isArray(value) ? value : [value];
  return list.flatMap((a) => a.value.map((v) => v.address ?? '')).filter((a) => a !== '');
}

/**
 * A local SMTP server that accepts any message on loopback and keeps it as a file for the development mailbox. It
 * answers 250 only after the message is stored, as a real server would only after it has queued it.
 *
 * @example
 * const catcher = await startMailCatcher({ folder: caughtMailFolder(dataDir), logger, port: 0 });
 */
export async function startMailCatcher(options: MailCatcherOptions): Promise<MailCatcher> {
  const now = options.now ?? (() => new Date());
  const server = new SMTPServer({
    authOptional: true,
    // plain SMTP on loopback: no TLS certificate to make, no password to know
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: maxMessageBytes,
    logger: false,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const receivedAt = now().toISOString();
          const id = `${receivedAt.replace(/\D/g, '')}-${randomBytes(4).toString('hex')}`;
          await saveCaughtMail(options.folder, {
            id,
            receivedAt,
            from: addresses(parsed.from)[0] ?? '',
            to: addresses(parsed.to),
            subject: parsed.subject ?? '',
            messageId: parsed.messageId ?? null,
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? sanitiseMailHtml(parsed.html) : null,
          });
          callback();
        })
        .catch((err: Error) => {
          options.logger.warn({ err }, 'the mail catcher could not keep a message');
          callback(err);
        });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host ?? '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  server.on('error', (err) => options.logger.warn({ err }, 'mail catcher error'));
  const port = (server.server.address() as AddressInfo).port;
  return {
    port,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

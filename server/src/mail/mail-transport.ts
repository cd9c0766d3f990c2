import { createTransport } from 'nodemailer';
import type { SmtpSettings } from '../config/config';

/** One message as handed to the mail server. */
export interface OutgoingMail {
  from: string;
  to: string;
  subject: string;
  text: string;
  html: string;
  /** Stable per outbox row, so a message sent twice after a crash can be recognised as one. */
  messageId: string;
}

/** Hands a message to a mail server; resolves only once the server has accepted it. */
export interface MailTransport {
  send(mail: OutgoingMail): Promise<void>;
  close(): void;
}

// 10 s to connect, greet and answer: long enough for a slow relay, short enough to not hold the sender (our choice)
const smtpTimeoutMs = 10_000;

/**
 * A nodemailer SMTP transport for the configured server.
 *
 * @example
 * const transport = smtpTransport({ host: '127.0.0.1', port: 2525, secure: false, from: 'lab@lab.test' });
 */
export function smtpTransport(settings: SmtpSettings): MailTransport {
  const transporter = createTransport({
    host: settings.host,
    port: settings.port,
    secure: settings.secure,
    ...(settings.user ? { auth: { user: settings.user, pass: settings.password ?? '' } } : {}),
    connectionTimeout: smtpTimeoutMs,
    greetingTimeout: smtpTimeoutMs,
    socketTimeout: smtpTimeoutMs,
  });
  return {
    async send(mail) {
      await transporter.sendMail(mail);
    },
    close() {
      transporter.close();
    },
  };
}

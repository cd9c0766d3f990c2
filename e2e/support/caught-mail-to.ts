import { apiAs } from './api-as';
import { demoPassword } from './demo-password';

/** A message the local mail catcher holds. */
export interface CaughtMail {
  subject: string;
  text: string;
  html: string | null;
}

/**
 * Waits for the outbox to hand a message for this address, with a subject matching `subject`, to the local mail
 * catcher, and reads it through the demo admin's mailbox.
 *
 * @example
 * const mail = await caughtMailTo(app.url, 'customer@clearbase.test', /^Payment received/);
 */
export async function caughtMailTo(
  appUrl: string,
  address: string,
  subject: RegExp = /./,
): Promise<CaughtMail> {
  const admin = await apiAs(appUrl, 'admin@clearbase.test', demoPassword);
  // the outbox sends within seconds; half a minute leaves room on a busy machine (our choice)
  const deadline = Date.now() + 30_000;
  for (;;) {
    const list = (await (await admin.get('/api/dev/mailbox')).json()) as {
      messages: { id: string; to: string[]; subject: string }[];
    };
    const found = list.messages.find((m) => m.to.includes(address) && subject.test(m.subject));
    if (found) return (await (await admin.get(`/api/dev/mailbox/${found.id}`)).json()) as CaughtMail;
    if (Date.now() > deadline) throw new Error(`no mail to ${address} matching ${subject} within 30 s`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

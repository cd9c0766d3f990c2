import type { Lab } from '@clearbase/contracts';
import { layMail } from './mail-layout';
import type { MailMessage } from './mail-message';

/** What each kind of message needs to be written. */
export interface MailTemplateData {
  'verify-email': { name: string; url: string; expiresHours: number };
  'already-registered': { name: string; signInUrl: string; resetUrl: string };
  'password-reset': { name: string; url: string; expiresMinutes: number };
  'account-created': { name: string; url: string; expiresHours: number };
  'payment-receipt': { name: string; amount: string; reference: string };
  'order-received': { name: string; reference: string; url: string };
  'scans-ready': { name: string; reference: string; url: string; galleryUrl: string; expiresHours: number };
}
export type MailKind = keyof MailTemplateData;

/** A span of whole hours in words: whole days as days ("7 days"), the rest as hours ("36 hours"). */
function lasting(hours: number): string {
  if (hours % 24 === 0) return hours === 24 ? '1 day' : `${hours / 24} days`;
  return hours === 1 ? '1 hour' : `${hours} hours`;
}

type Template<K extends MailKind> = (lab: Lab, data: MailTemplateData[K]) => ReturnType<typeof layMail>;

const templates: { [K in MailKind]: Template<K> } = {
  'verify-email': (lab, d) =>
    layMail(lab, {
      subject: `Confirm your e-mail address for ${lab.name}`,
      greetingName: d.name,
      paragraphs: [
        `Thank you for signing up with ${lab.name}.`,
        'Confirm that this address is yours and your account is ready: you can then sign in and send us film.',
      ],
      action: { label: 'Confirm my e-mail address', url: d.url },
      after: [
        `The link works for ${d.expiresHours} hours.`,
        'If you did not sign up, ignore this message: no account is made without the link.',
      ],
    }),
  'already-registered': (lab, d) =>
    layMail(lab, {
      subject: `You already have an account with ${lab.name}`,
      greetingName: d.name,
      paragraphs: [
        'Someone, perhaps you, tried to sign up again with this e-mail address. Your account is unchanged.',
      ],
      action: { label: 'Sign in', url: d.signInUrl },
      after: [`Forgotten your password? Choose a new one here: ${d.resetUrl}`],
    }),
  'password-reset': (lab, d) =>
    layMail(lab, {
      subject: `Choose a new password for ${lab.name}`,
      greetingName: d.name,
      paragraphs: ['We were asked to reset the password of your account.'],
      action: { label: 'Choose a new password', url: d.url },
      after: [
        `The link works once, for ${d.expiresMinutes} minutes.`,
        'If you did not ask for this, ignore this message: your password stays as it is.',
      ],
    }),
  'account-created': (lab, d) =>
    layMail(lab, {
      subject: `Your account with ${lab.name}`,
      greetingName: d.name,
      paragraphs: [
        `${lab.name} made an account for you, so you can follow your orders and download your scans.`,
        'Choose a password to start using it.',
      ],
      action: { label: 'Choose my password', url: d.url },
      after: [`The link works once, for ${d.expiresHours} hours.`],
    }),
  'payment-receipt': (lab, d) =>
    layMail(lab, {
      subject: `Payment received: ${d.reference}`,
      greetingName: d.name,
      paragraphs: [`We received your payment of ${d.amount} for ${d.reference}. Thank you.`],
    }),
  'order-received': (lab, d) =>
    layMail(lab, {
      subject: `We have your order: ${d.reference}`,
      greetingName: d.name,
      paragraphs: [
        `${lab.name} has received ${d.reference}. Send or bring us your film, with the order’s number on the parcel.`,
        'We write again when your scans are ready. You can follow each step on the order’s page.',
      ],
      action: { label: 'Follow my order', url: d.url },
    }),
  'scans-ready': (lab, d) =>
    layMail(lab, {
      subject: `Your scans are ready: ${d.reference}`,
      greetingName: d.name,
      paragraphs: [
        `The scans of ${d.reference} are ready to view and download.`,
        `See them one by one in your gallery: ${d.galleryUrl}`,
      ],
      action: { label: 'Download all my scans', url: d.url },
      after: [
        `Sign in first: the link works only for your account, for ${lasting(d.expiresHours)}; after that the gallery gives you a fresh one.`,
      ],
    }),
};

/**
 * Writes a message of one kind for one recipient, in the lab's name.
 *
 * @example
 * const mail = renderMail(lab, 'cass@example.test', 'verify-email', { name: 'Cass', url, expiresHours: 24 });
 */
export function renderMail<K extends MailKind>(
  lab: Lab,
  to: string,
  kind: K,
  data: MailTemplateData[K],
): MailMessage {
  const template = templates[kind] as Template<K>;
  return { to, kind, ...template(lab, data) };
}

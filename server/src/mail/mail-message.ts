/** An e-mail with both parts, ready for the outbox. */
export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html: string;
  /** Which template made it, e.g. `verify-email`. */
  kind: string;
}

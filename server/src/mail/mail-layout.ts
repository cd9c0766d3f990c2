import type { Lab } from '@clearbase/contracts';
import { escapeHtml } from './escape-html';

/** The body of a message before the lab's greeting and signature are put round it. */
export interface MailContent {
  subject: string;
  greetingName: string;
  /** Paragraphs of plain text. */
  paragraphs: readonly string[];
  /** One call to action: a button in HTML, a bare line in text. */
  action?: { label: string; url: string };
  /** Said after the action, e.g. when the link stops working. */
  after?: readonly string[];
}

function labLines(lab: Lab): string[] {
  return [lab.name, lab.address || lab.town].filter((line) => line.trim() !== '');
}

/**
 * Puts the lab's name and address round a message, as a plain-text part and an HTML part saying the same thing.
 *
 * @example
 * const { text, html } = layMail(lab, { subject: 'Hello', greetingName: 'Cass', paragraphs: ['Your film is in.'] });
 */
export function layMail(lab: Lab, content: MailContent): { subject: string; text: string; html: string } {
  const after = content.after ?? [];
  const text = [
    `Hello ${content.greetingName},`,
    '',
    ...content.paragraphs.flatMap((p) => [p, '']),
    ...(content.action ? [`${content.action.label}:`, content.action.url, ''] : []),
    ...after.flatMap((p) => [p, '']),
    '—',
    ...labLines(lab),
  ].join('\n');
  const p = (s: string) => `<p style="margin:0 0 16px">${escapeHtml(s)}</p>`;
  const html = [
    '<!doctype html>',
    `<html><head><meta charset="utf-8"><title>${escapeHtml(content.subject)}</title></head>`,
    '<body style="font-family:sans-serif;color:#1b1f24;line-height:1.5;max-width:560px;margin:0 auto;padding:24px">',
    p(`Hello ${content.greetingName},`),
    ...content.paragraphs.map(p),
    ...(content.action
      ? [
          `<p style="margin:24px 0"><a href="${escapeHtml(content.action.url)}" ` +
            'style="background:#24525e;color:#fff;padding:10px 18px;border-radius:6px;text-decoration:none">' +
            `${escapeHtml(content.action.label)}</a></p>`,
          `<p style="margin:0 0 16px;font-size:13px;color:#555">${escapeHtml(content.action.url)}</p>`,
        ]
      : []),
    ...after.map(p),
    `<p style="margin:32px 0 0;font-size:13px;color:#555">${labLines(lab).map(escapeHtml).join('<br>')}</p>`,
    '</body></html>',
  ].join('\n');
  return { subject: content.subject, text, html };
}

import type { Lab } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import { renderMail, type MailKind, type MailTemplateData } from './mail-templates';

const lab: Lab = {
  name: 'Saltmarsh Film Works',
  town: 'Wrenmouth',
  address: '3 Tide Lane, Wrenmouth',
  payOnCollection: false,
};

const samples: { [K in MailKind]: MailTemplateData[K] } = {
  'verify-email': { name: 'Cass', url: 'https://lab.test/verify-email?token=t', expiresHours: 24 },
  'already-registered': {
    name: 'Cass',
    signInUrl: 'https://lab.test/sign-in',
    resetUrl: 'https://lab.test/forgot',
  },
  'password-reset': { name: 'Cass', url: 'https://lab.test/reset-password?token=t', expiresMinutes: 60 },
  'account-created': { name: 'Cass', url: 'https://lab.test/reset-password?token=t', expiresHours: 72 },
  'payment-receipt': { name: 'Cass', amount: '€23.00', reference: 'order 4' },
  'order-received': { name: 'Cass', reference: 'order 4', url: 'https://lab.test/orders/4' },
  'scans-ready': {
    name: 'Cass',
    reference: 'order 4',
    url: 'https://lab.test/api/downloads/abc',
    galleryUrl: 'https://lab.test/orders/4/gallery',
    expiresHours: 168,
  },
};

describe('mail templates', () => {
  for (const kind of Object.keys(samples) as MailKind[]) {
    it(`writes ${kind} in both parts, signed with the lab's name and address`, () => {
      const mail = renderMail(lab, 'cass@example.test', kind, samples[kind] as never);
      expect(mail).toMatchObject({ to: 'cass@example.test', kind });
      expect(mail.subject.length).toBeGreaterThan(0);
      for (const part of [mail.text, mail.html]) {
        expect(part).toContain('Hello Cass,');
        expect(part).toContain('Saltmarsh Film Works');
        expect(part).toContain('3 Tide Lane, Wrenmouth');
      }
      expect(mail.html).toMatch(/^<!doctype html>/);
      expect(mail.text).not.toMatch(/<[a-z]/i);
    });
  }

  it("words the download link's life in days when it is whole days, in hours otherwise", () => {
    const week = renderMail(lab, 'x@example.test', 'scans-ready', samples['scans-ready']);
    expect(week.text).toContain('for 7 days;');
    const shortLink = renderMail(lab, 'x@example.test', 'scans-ready', {
      ...samples['scans-ready'],
      expiresHours: 36,
    });
    expect(shortLink.text).toContain('for 36 hours;');
  });

  it('escapes what people typed before it goes into the HTML part', () => {
    const mail = renderMail(lab, 'x@example.test', 'payment-receipt', {
      name: '<img src=x onerror=alert(1)>',
      amount: '€1.00',
      reference: 'order "5"',
    });
    expect(mail.html).not.toContain('<img');
    expect(mail.html).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(mail.html).toContain('order &quot;5&quot;');
    expect(mail.text).toContain('Hello <img src=x onerror=alert(1)>,');
  });
});

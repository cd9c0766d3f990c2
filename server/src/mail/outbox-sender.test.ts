import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listCaughtMail, readCaughtMail } from '../dev-mailbox/caught-mail-store';
import { startMailCatcher, type MailCatcher } from '../dev-mailbox/mail-catcher';
import { createTestApp, type TestApp } from '../test-support/test-app';
import { smtpTransport } from './mail-transport';
import { enqueueTemplatedMail } from './outbox-repository';
import { createOutboxSender } from './outbox-sender';

const logger = pino({ level: 'silent' });
let t: TestApp;
const folder = mkdtempSync(join(tmpdir(), 'clearbase-caught-'));

beforeAll(async () => {
  t = await createTestApp();
  await t.db
    .insertInto('settings')
    .values({
      key: 'lab',
      value: JSON.stringify({
        name: 'Saltmarsh Film Works',
        town: 'Wrenmouth',
        address: '3 Tide Lane, Wrenmouth',
      }),
    })
    .execute();
});
afterAll(async () => {
  await t.close();
  rmSync(folder, { recursive: true, force: true });
});

async function outboxRow(id: number) {
  return t.db.selectFrom('outbox').selectAll().where('id', '=', id).executeTakeFirstOrThrow();
}

describe('the outbox sender', () => {
  it('keeps a message while the mail server is down, retries it later and delivers it once the server is back', async () => {
    // a free port the catcher will come back on
    const probe = await startMailCatcher({ folder, logger });
    const port = probe.port;
    await probe.stop();
    const transport = smtpTransport({ host: '127.0.0.1', port, secure: false, from: 'desk@saltmarsh.test' });
    const sender = createOutboxSender({
      db: t.db,
      clock: t.clock,
      logger,
      transport,
      fromAddress: 'desk@saltmarsh.test',
      messageIdHost: 'saltmarsh.test',
    });
    const start = new Date('2026-03-02T09:00:00Z');
    t.clock.set(start);
    const id = await t.db
      .transaction()
      .execute((trx) =>
        enqueueTemplatedMail(
          trx,
          'cass@example.test',
          'verify-email',
          { name: 'Cass <Ferrow>', url: 'http://127.0.0.1:4300/verify?token=abc&x=1', expiresHours: 24 },
          t.clock.now(),
        ),
      );

    expect(await sender.runOnce()).toBe(0);
    const afterFailure = await outboxRow(id);
    expect(afterFailure).toMatchObject({ state: 'pending', attempts: 1, sent_at: null });
    expect(afterFailure.last_error).toMatch(/ECONNREFUSED|connect/i);
    expect(afterFailure.next_attempt_at).toBe('2026-03-02T09:00:30.000Z');

    // not due yet: no second try before the back-off has passed
    t.clock.set(new Date(start.getTime() + 10_000));
    expect(await sender.runOnce()).toBe(0);
    expect((await outboxRow(id)).attempts).toBe(1);

    let catcher: MailCatcher | undefined;
    try {
      catcher = await startMailCatcher({ folder, logger, port });
      t.clock.set(new Date(start.getTime() + 31_000));
      expect(await sender.runOnce()).toBe(1);
    } finally {
      await sender.stop();
      await catcher?.stop();
    }

    const sent = await outboxRow(id);
    expect(sent).toMatchObject({ state: 'sent', attempts: 2, sent_at: '2026-03-02T09:00:31.000Z' });
    const caught = await listCaughtMail(folder);
    expect(caught).toHaveLength(1);
    const mail = (await readCaughtMail(folder, caught[0]!.id))!;
    expect(mail.to).toEqual(['cass@example.test']);
    expect(mail.from).toBe('desk@saltmarsh.test');
    expect(mail.subject).toBe('Confirm your e-mail address for Saltmarsh Film Works');
    expect(mail.messageId).toMatch(new RegExp(`^<outbox-${id}-\\d+@saltmarsh\\.test>$`));
    expect(mail.text).toContain('Hello Cass <Ferrow>,');
    expect(mail.text).toContain('http://127.0.0.1:4300/verify?token=abc&x=1');
    expect(mail.text).toContain('3 Tide Lane, Wrenmouth');
    expect(mail.html).toContain('Hello Cass &lt;Ferrow&gt;,');
    expect(mail.html).toContain('href="http://127.0.0.1:4300/verify?token=abc&amp;x=1"');
    expect(mail.html).toContain('Saltmarsh Film Works');
  });

  it('sends nothing twice: a delivered message is not picked up again', async () => {
    const catcher = await startMailCatcher({ folder, logger });
    const sender = createOutboxSender({
      db: t.db,
      clock: t.clock,
      logger,
      transport: smtpTransport({ host: '127.0.0.1', port: catcher.port, secure: false, from: 'x@y.test' }),
      fromAddress: 'desk@saltmarsh.test',
      messageIdHost: 'saltmarsh.test',
    });
    try {
      await enqueueTemplatedMail(
        t.db,
        'ines@example.test',
        'payment-receipt',
        { name: 'Ines', amount: '€12.00', reference: 'order 7' },
        t.clock.now(),
      );
      const [first, second] = await Promise.all([sender.runOnce(), sender.runOnce()]);
      expect(first).toBe(1);
      expect(second).toBe(1); // the same pass, shared
      expect(await sender.runOnce()).toBe(0);
    } finally {
      await sender.stop();
      await catcher.stop();
    }
    const receipts = (await listCaughtMail(folder)).filter((m) => m.subject === 'Payment received: order 7');
    expect(receipts).toHaveLength(1);
  });

  it('gives up after twelve failed attempts and says why', async () => {
    const transport = {
      send: () => Promise.reject(new Error('550 mailbox unavailable')),
      close: () => undefined,
    };
    const sender = createOutboxSender({
      db: t.db,
      clock: t.clock,
      logger,
      transport,
      fromAddress: 'desk@saltmarsh.test',
      messageIdHost: 'saltmarsh.test',
    });
    const id = await enqueueTemplatedMail(
      t.db,
      'nobody@example.test',
      'payment-receipt',
      { name: 'N', amount: '€1.00', reference: 'order 8' },
      t.clock.now(),
    );
    for (let i = 0; i < 12; i++) {
      t.clock.set(new Date(t.clock.now().getTime() + 3600_000));
      await sender.runOnce();
    }
    expect(await outboxRow(id)).toMatchObject({
      state: 'failed',
      attempts: 12,
      last_error: '550 mailbox unavailable',
    });
  });
});

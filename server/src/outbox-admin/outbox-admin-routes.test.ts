import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MailTransport, OutgoingMail } from '../mail/mail-transport';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import { createOutboxSender, type OutboxSender } from '../mail/outbox-sender';
import {
  addUser,
  client,
  createTestApp,
  signedIn,
  type Client,
  type TestApp,
} from '../test-support/test-app';

const logger = pino({ level: 'silent' });
let t: TestApp;
let admin: Client;
let sender: OutboxSender;
/** The mail server the sender talks to: refuses while `down`, records what it accepts. */
const mailServer = { down: true, accepted: [] as OutgoingMail[] };
const transport: MailTransport = {
  send: (mail) => {
    if (mailServer.down) return Promise.reject(new Error('421 service not available'));
    mailServer.accepted.push(mail);
    return Promise.resolve();
  },
  close: () => undefined,
};

beforeAll(async () => {
  t = await createTestApp();
  await addUser(t.db, 'admin');
  await addUser(t.db, 'operator');
  admin = await signedIn(t.app, 'admin@lab.test');
  sender = createOutboxSender({
    db: t.db,
    clock: t.clock,
    logger,
    transport,
    fromAddress: 'desk@lab.test',
    messageIdHost: 'lab.test',
  });
});
afterAll(async () => {
  await sender.stop();
  await t.close();
});

describe('the outbox for admins', () => {
  it('lists a message waiting for a retry with its tries and error but not its body, and sends it on "retry now"', async () => {
    const start = new Date('2026-05-04T10:00:00Z');
    t.clock.set(start);
    const id = await enqueueTemplatedMail(
      t.db,
      'forgetful@example.test',
      'password-reset',
      { name: 'Odile', url: 'http://lab.test/reset-password?token=secret-token-123', expiresMinutes: 60 },
      t.clock.now(),
    );
    await sender.runOnce();

    const pending = await admin.get('/api/admin/outbox?status=pending').expect(200);
    expect(pending.body.entries).toEqual([
      {
        id,
        to: 'forgetful@example.test',
        subject: expect.stringContaining('Choose a new password'),
        kind: 'password-reset',
        state: 'pending',
        attempts: 1,
        lastError: '421 service not available',
        nextAttemptAt: '2026-05-04T10:00:30.000Z',
        createdAt: '2026-05-04T10:00:00.000Z',
      },
    ]);
    expect(pending.text).not.toContain('secret-token-123');
    expect((await admin.get('/api/admin/outbox?status=failed')).body.entries).toEqual([]);

    mailServer.down = false;
    const retried = await admin.post(`/api/admin/outbox/${id}/retry`).expect(202);
    expect(retried.body.entry).toMatchObject({ id, state: 'pending', nextAttemptAt: start.toISOString() });
    const audit = await t.db
      .selectFrom('audit_log')
      .select(['action', 'target'])
      .where('action', '=', 'mail-retried')
      .execute();
    expect(audit).toEqual([{ action: 'mail-retried', target: `outbox:${id}` }]);
    expect(await sender.runOnce()).toBe(1);
    expect(mailServer.accepted.map((m) => m.to)).toEqual(['forgetful@example.test']);
    expect((await admin.get('/api/admin/outbox?status=pending')).body.entries).toEqual([]);

    const again = await admin.post(`/api/admin/outbox/${id}/retry`).expect(409);
    expect(again.headers['content-type']).toMatch(/application\/problem\+json/);
  });

  it('lists a message the sender gave up on, by default, and tries it once more on "retry now"', async () => {
    mailServer.down = true;
    mailServer.accepted = [];
    const id = await enqueueTemplatedMail(
      t.db,
      'gone@example.test',
      'payment-receipt',
      { name: 'Bram', amount: '€9.00', reference: 'order 2' },
      t.clock.now(),
    );
    for (let i = 0; i < 12; i++) {
      t.clock.set(new Date(t.clock.now().getTime() + 3600_000));
      await sender.runOnce();
    }
    const failed = await admin.get('/api/admin/outbox').expect(200);
    expect(failed.body.entries).toMatchObject([
      { id, state: 'failed', attempts: 12, nextAttemptAt: null, lastError: '421 service not available' },
    ]);

    mailServer.down = false;
    await admin.post(`/api/admin/outbox/${id}/retry`).expect(202);
    expect(await sender.runOnce()).toBe(1);
    expect(mailServer.accepted.map((m) => m.subject)).toEqual(['Payment received: order 2']);
    expect((await admin.get('/api/admin/outbox')).body.entries).toEqual([]);
  });

  it('answers 404 for a message that does not exist and 400 for a status it does not know', async () => {
    await admin.post('/api/admin/outbox/99999/retry').expect(404);
    const bad = await admin.get('/api/admin/outbox?status=sent').expect(400);
    expect(bad.body.errors[0].path).toBe('query.status');
  });

  it('is for admins only', async () => {
    const operator = await signedIn(t.app, 'operator@lab.test');
    await operator.get('/api/admin/outbox').expect(403);
    await operator.post('/api/admin/outbox/1/retry').expect(403);
    const visitor = await client(t.app);
    await visitor.get('/api/admin/outbox').expect(401);
  });
});

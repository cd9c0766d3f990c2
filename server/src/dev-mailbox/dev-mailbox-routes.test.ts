import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, signedIn, type TestApp } from '../test-support/test-app';
import { caughtMailFolder, saveCaughtMail } from './caught-mail-store';

let t: TestApp;
let off: TestApp;

beforeAll(async () => {
  t = await createTestApp({ LOCAL_FAKES: 'true' });
  off = await createTestApp({
    LOCAL_FAKES: 'false',
    SMTP_PORT: '2525',
    PAYMENT_API_BASE: 'https://payments.example.test',
    PAYMENT_SECRET_KEY: 'sk_live_abcdefgh',
    PAYMENT_WEBHOOK_SECRET: 'whsec_abcdefgh',
  });
  for (const app of [t, off]) {
    await addUser(app.db, 'admin');
    await addUser(app.db, 'manager');
  }
  const folder = caughtMailFolder(t.config.dataDir);
  await saveCaughtMail(folder, {
    id: '20260302090000000-aaaa',
    receivedAt: '2026-03-02T09:00:00.000Z',
    from: 'desk@lab.test',
    to: ['cass@example.test'],
    subject: 'Older',
    messageId: null,
    text: 'old',
    html: null,
  });
  await saveCaughtMail(folder, {
    id: '20260302100000000-bbbb',
    receivedAt: '2026-03-02T10:00:00.000Z',
    from: 'desk@lab.test',
    to: ['cass@example.test'],
    subject: 'Newer',
    messageId: '<m@lab.test>',
    text: 'new',
    html: '<p>new</p>',
  });
});
afterAll(async () => {
  await t.close();
  await off.close();
});

describe('the development mailbox', () => {
  it('lists caught mail newest first and shows one message whole', async () => {
    const admin = await signedIn(t.app, 'admin@lab.test');
    const list = await admin.get('/api/dev/mailbox');
    expect(list.status).toBe(200);
    expect(list.body.messages.map((m: { subject: string }) => m.subject)).toEqual(['Newer', 'Older']);
    const one = await admin.get('/api/dev/mailbox/20260302100000000-bbbb');
    expect(one.body).toMatchObject({ text: 'new', html: '<p>new</p>', messageId: '<m@lab.test>' });
  });

  it('answers 404 for an unknown message and refuses ids that could leave the folder', async () => {
    const admin = await signedIn(t.app, 'admin@lab.test');
    expect((await admin.get('/api/dev/mailbox/20990101000000000-cccc')).status).toBe(404);
    expect((await admin.get('/api/dev/mailbox/..%2Fsession-secret')).status).toBe(400);
  });

  it('is for admins only', async () => {
    const manager = await signedIn(t.app, 'manager@lab.test');
    expect((await manager.get('/api/dev/mailbox')).status).toBe(403);
  });

  it('does not exist when the server talks to a real mail server', async () => {
    const admin = await signedIn(off.app, 'admin@lab.test');
    const res = await admin.get('/api/dev/mailbox');
    expect(res.status).toBe(404);
    expect(res.body.code).toBe('no-dev-mailbox');
  });
});

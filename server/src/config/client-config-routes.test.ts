import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, client, createTestApp, signedIn, type TestApp } from '../test-support/test-app';

const production = {
  LOCAL_FAKES: 'false',
  SMTP_PORT: '2525',
  PAYMENT_API_BASE: 'http://127.0.0.1:9/',
  PAYMENT_SECRET_KEY: 'sk_test_not_used',
  PAYMENT_WEBHOOK_SECRET: 'whsec_not_used',
};

describe('the web app’s view of the settings', () => {
  let withFakes: TestApp;
  let withoutFakes: TestApp;
  beforeAll(async () => {
    withFakes = await createTestApp({ LOCAL_FAKES: 'true' });
    withoutFakes = await createTestApp(production);
    await addUser(withoutFakes.db, 'admin');
  });
  afterAll(async () => {
    await withFakes.close();
    await withoutFakes.close();
  });

  it('tells anyone whether the local fakes run', async () => {
    expect((await (await client(withFakes.app)).get('/api/config/client').expect(200)).body).toEqual({
      localFakes: true,
    });
    expect((await (await client(withoutFakes.app)).get('/api/config/client').expect(200)).body).toEqual({
      localFakes: false,
    });
  });

  it('goes with a development mailbox that refuses, even an admin, when the fakes are off', async () => {
    const admin = await signedIn(withoutFakes.app, 'admin@lab.test');
    const res = await admin.get('/api/dev/mailbox').expect(404);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  });
});

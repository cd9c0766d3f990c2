import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { systemClock } from '../clock';
import { demoLab, seedDemo } from '../demo/seed';
import { addUser, createTestApp, signedIn, type TestApp } from '../test-support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

describe('GET /api/lab', () => {
  it('answers a neutral name before the lab is named', async () => {
    const res = await request(t.app).get('/api/lab');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ name: 'Clearbase', town: '', address: '', payOnCollection: false });
  });

  it('answers the seeded demo lab to anyone', async () => {
    await seedDemo(t.db, { clock: systemClock });
    const res = await request(t.app).get('/api/lab');
    expect(res.body).toEqual(demoLab);
  });

  it('lets an admin rename the lab, and records the change', async () => {
    await addUser(t.db, 'admin', 'boss@lab.test');
    const admin = await signedIn(t.app, 'boss@lab.test');
    const next = {
      name: 'Harbour Street Film Lab',
      town: 'Wrenmouth',
      address: '2 Harbour Street, Wrenmouth',
    };
    const res = await admin.send('put', '/api/lab', next);
    expect(res.status).toBe(200);
    // the lab pays first unless told otherwise
    expect((await request(t.app).get('/api/lab')).body).toEqual({ ...next, payOnCollection: false });
    const audit = await admin.get('/api/audit?action=settings-changed');
    expect(audit.body.entries[0]).toMatchObject({
      actorEmail: 'boss@lab.test',
      target: 'lab',
      details: { after: { ...next, payOnCollection: false } },
    });
  });

  it('lets an admin take payment on collection', async () => {
    const admin = await signedIn(t.app, 'boss@lab.test');
    const lab = { name: 'Harbour Street Film Lab', town: 'Wrenmouth', address: '', payOnCollection: true };
    await admin.send('put', '/api/lab', lab).expect(200);
    expect((await request(t.app).get('/api/lab')).body.payOnCollection).toBe(true);
    const refused = await admin.send('put', '/api/lab', { ...lab, payOnCollection: 'yes' });
    expect(refused.status).toBe(400);
    expect(refused.body.errors[0].path).toBe('body.payOnCollection');
  });

  it('refuses an empty lab name, naming the field', async () => {
    const admin = await signedIn(t.app, 'boss@lab.test');
    const res = await admin.send('put', '/api/lab', { name: '', town: '', address: '' });
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe('body.name');
  });
});

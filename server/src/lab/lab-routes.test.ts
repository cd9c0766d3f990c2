import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { systemClock } from '../clock';
import { demoLab, seedDemo } from '../demo/seed';
import { createTestApp, type TestApp } from '../test-support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

describe('GET /api/lab', () => {
  it('answers a neutral name before the lab is named', async () => {
    const res = await request(t.app).get('/api/lab');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ name: 'Clearbase', town: '', address: '' });
  });

  it('answers the seeded demo lab to anyone', async () => {
    await seedDemo(t.db, { clock: systemClock });
    const res = await request(t.app).get('/api/lab');
    expect(res.body).toEqual(demoLab);
  });
});

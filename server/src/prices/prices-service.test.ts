import type { PriceList, User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { starterPriceList } from './price-list-store';
import { createPricesService } from './prices-service';

let t: TestApp;
let manager: User;
beforeAll(async () => {
  t = await createTestApp();
  manager = { id: await addUser(t.db, 'manager'), email: 'manager@lab.test', name: 'M', role: 'manager' };
});
afterAll(() => t.close());

const small: PriceList = {
  currency: 'EUR',
  develop: [{ format: '135-36', process: 'C-41', amountMinor: 1100 }],
  scan: [{ size: 'standard', amountMinor: 700 }],
  pushPullPerStopMinor: 250,
  returnByPostMinor: 400,
};

describe('the prices service', () => {
  it('replaces the list and audits what it was before', async () => {
    const prices = createPricesService({ db: t.db, clock: t.clock });
    await prices.replace(manager, small);
    expect(await prices.list()).toEqual(small);
    const audit = await t.db.selectFrom('audit_log').selectAll().where('target', '=', 'price-list').execute();
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0]!.details!)).toEqual({ before: starterPriceList, after: small });
  });

  it('refuses to quote what the list has no price for, saying what to do', async () => {
    const prices = createPricesService({ db: t.db, clock: t.clock });
    await expect(
      prices.quote({ scanSize: 'full', rolls: [{ format: '120', process: 'C-41', pushPull: 0 }] } as never),
    ).rejects.toMatchObject({ status: 422, code: 'no-price', message: expect.stringMatching(/Ask the lab/) });
  });
});

import type { User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { createStocksService } from './stocks-service';

let t: TestApp;
let manager: User;
beforeAll(async () => {
  t = await createTestApp();
  manager = { id: await addUser(t.db, 'manager'), email: 'manager@lab.test', name: 'M', role: 'manager' };
});
afterAll(() => t.close());

const stock = (name: string) => ({
  name,
  maker: 'Invented Emulsions',
  iso: 200,
  process: 'C-41' as const,
  masked: false,
  baseMaterial: 'clear polyester',
  frameFormats: ['135-36'],
});

describe('the stocks service', () => {
  it('refuses a second stock of the same name, naming the field, and keeps one', async () => {
    const stocks = createStocksService({ db: t.db, clock: t.clock });
    await stocks.create(manager, stock('Fenlight 200') as never);
    await expect(stocks.create(manager, stock('Fenlight 200') as never)).rejects.toMatchObject({
      status: 409,
      code: 'stock-name-taken',
      errors: [{ path: 'body.name', message: 'Another stock has this name' }],
    });
    expect((await stocks.list({} as never)).filter((s) => s.name === 'Fenlight 200')).toHaveLength(1);
  });

  it('audits a sheet change with the stock before and after, and 404s an unknown stock', async () => {
    const stocks = createStocksService({ db: t.db, clock: t.clock });
    const created = await stocks.create(manager, stock('Marsh 400') as never);
    const updated = await stocks.updateSheet(manager, created.id, { notes: 'Pulls well.' } as never);
    const [audit] = await t.db
      .selectFrom('audit_log')
      .select('details')
      .where('action', '=', 'stock-sheet-updated')
      .where('target', '=', `stock:${created.id}`)
      .execute();
    expect(JSON.parse(audit!.details!)).toMatchObject({
      before: { notes: '' },
      after: { notes: updated.notes },
    });
    await expect(stocks.detail(99_999)).rejects.toMatchObject({ status: 404, code: 'stock-not-found' });
  });
});

import { validateProfileDocument } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from './seed';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';

let t: TestApp;
let operator: Client;
beforeAll(async () => {
  t = await createTestApp();
  expect(await seedDemo(t.db, { clock: t.clock })).toBe(true);
  await addUser(t.db, 'operator', 'op@lab.test');
  operator = await signedIn(t.app, 'op@lab.test');
});
afterAll(() => t.close());

describe('demo catalogue', () => {
  it('holds three stocks, two unmasked on polyester and one masked', async () => {
    const { stocks } = (await operator.get('/api/stocks')).body;
    expect(stocks).toHaveLength(3);
    const unmasked = stocks.filter((s: { masked: boolean }) => !s.masked);
    expect(unmasked).toHaveLength(2);
    for (const s of unmasked) expect(s.baseMaterial).toMatch(/polyester/);
  });

  it('gives each stock a published profile version and one open draft made from it, with valid documents', async () => {
    const { stocks } = (await operator.get('/api/stocks')).body;
    for (const stock of stocks) {
      const page = (await operator.get(`/api/stocks/${stock.id}`)).body;
      expect(page.profiles).toHaveLength(1);
      const [v1, v2] = page.profiles[0].versions;
      expect(page.profiles[0].versions).toHaveLength(2);
      expect(v1).toMatchObject({ version: 1, status: 'published', changelog: expect.any(String) });
      expect(v2).toMatchObject({ version: 2, status: 'draft', parentVersionId: v1.id });
      for (const v of [v1, v2]) {
        const { parameters } = (await operator.get(`/api/profile-versions/${v.id}`)).body.version;
        expect(validateProfileDocument(parameters).ok).toBe(true);
        expect(parameters.stock.base).toBe(
          stock.masked ? 'masked' : stock.baseMaterial.includes('tinted') ? 'tinted' : 'clear',
        );
      }
      const diff = (await operator.get(`/api/profile-versions/${v1.id}/diff/${v2.id}`)).body;
      expect(diff.changes.map((c: { path: string }) => c.path)).toEqual(['balance.magentaGreen']);
    }
  });

  it('holds one scanner of each kind', async () => {
    const { scanners } = (await operator.get('/api/scanners')).body;
    expect(scanners.map((s: { kind: string }) => s.kind).sort()).toEqual([
      'camera-rig',
      'flatbed',
      'lab-scanner',
    ]);
  });
});

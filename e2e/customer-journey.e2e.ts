import { readFileSync, readdirSync, rmSync } from 'node:fs';
import { basename, extname, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { zipEntries } from '../server/src/downloads/zip-entries';
import { apiAs } from './support/api-as';
import { useBrowserApp } from './support/browser-app';
import { caughtMailTo } from './support/caught-mail-to';
import { demoPassword } from './support/demo-password';
import { synthNegatives } from './support/synth-negatives';

const customerEmail = 'ottilie.marsh@example.test';
const customerPassword = 'reed-beds-at-dusk';

let scans: string;
let negatives: string[];

const app = useBrowserApp({
  prepare() {
    // two small 16-bit negatives per roll from the forward model
    scans = synthNegatives('clearbase-journey-', { frames: 2, width: 240, height: 160 });
    negatives = readdirSync(scans).sort();
  },
});

afterAll(() => {
  if (scans) rmSync(scans, { recursive: true, force: true });
});

async function until<T>(what: string, probe: () => Promise<T | undefined>, seconds = 90): Promise<T> {
  const deadline = Date.now() + seconds * 1000;
  for (;;) {
    const value = await probe();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`${what} did not happen within ${seconds} s`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

describe('a customer’s whole journey', () => {
  it('signs up, orders two rolls, pays, and downloads every finished frame in one zip', async () => {
    const { page } = app.browser;
    // sign up in the browser and confirm the address from the caught mail
    await page.goto(`${app.url}/sign-up`);
    await page.getByTestId('sign-up-name').fill('Ottilie Marsh');
    await page.getByTestId('sign-up-email').fill(customerEmail);
    await page.getByTestId('sign-up-password').fill(customerPassword);
    await page.getByTestId('sign-up-submit').click();
    await page.getByTestId('sign-up-sent').waitFor();
    const verify = await caughtMailTo(app.url, customerEmail, /^Confirm your e-mail address/);
    const link = /http:\/\/127\.0\.0\.1:\d+\/verify-email\?token=[A-Za-z0-9_-]+/.exec(verify.text)?.[0];
    expect(link, verify.text).toBeDefined();
    await page.goto(link!);
    await page.getByTestId('verify-done').waitFor();

    // signed in, the customer orders two rolls through the order form's steps
    await page.getByTestId('verify-sign-in').click();
    await page.getByTestId('sign-in-email').fill(customerEmail);
    await page.getByTestId('sign-in-password').fill(customerPassword);
    await page.getByTestId('sign-in-submit').click();
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    const customer = await apiAs(app.url, customerEmail, customerPassword);
    const { stocks } = (await (await customer.get('/api/stocks')).json()) as {
      stocks: { id: number; name: string; frameFormats: string[]; process: string }[];
    };
    // a C-41 stock on 135 that can be ordered: it has a published profile version
    let stock: (typeof stocks)[number] | undefined;
    for (const candidate of stocks.filter((s) => s.frameFormats.includes('135-36') && s.process === 'C-41')) {
      const { profiles } = (await (await customer.get(`/api/stocks/${candidate.id}`)).json()) as {
        profiles: { versions: { status: string }[] }[];
      };
      if (profiles.some((p) => p.versions.some((v) => v.status === 'published'))) {
        stock = candidate;
        break;
      }
    }
    expect(stock).toBeDefined();
    await page.goto(`${app.url}/orders`);
    await page.getByTestId('orders-new').click();
    for (const [i, development] of ['Normal', '+1 stop push'].entries()) {
      if (i > 0) await page.getByTestId('add-roll-line').click();
      await page.getByTestId(`roll-${i}-stock`).click();
      await page.locator('mat-option', { hasText: stock!.name }).first().click();
      await page.getByTestId(`roll-${i}-ei`).fill('400');
      await page.getByTestId(`roll-${i}-push-pull`).click();
      await page.getByRole('option', { name: development, exact: true }).click();
      await page.getByTestId(`roll-${i}-format`).fill('135-36');
      await page.keyboard.press('Escape');
    }
    await page.getByTestId('rolls-next').click();
    await page.getByTestId('scans-next').click();
    await page.getByTestId('negatives-post').locator('input').check();
    await page.getByTestId('address-name').fill('Ottilie Marsh');
    await page.getByTestId('address-line1').fill('3 Heron Steps');
    await page.getByTestId('address-town').fill('Fenmouth');
    await page.getByTestId('address-postcode').fill('FM1 2AB');
    await page.getByTestId('address-country').fill('Testland');
    await page.getByTestId('delivery-next').click();
    await page.getByTestId('new-order-notes').fill('The second roll was shot at dusk.');
    await page.getByTestId('notes-next').click();

    // the review shows the lab's price, from its price list, before anything is paid
    const expected = (await (
      await customer.post('/api/prices/quote', {
        scanSize: 'standard',
        negatives: 'post',
        rolls: [0, 1].map((pushPull) => ({ format: '135-36', process: 'C-41', pushPull })),
      })
    ).json()) as { currency: string; totalMinor: number };
    const total = page.getByTestId('quote-total');
    await total.waitFor();
    expect((await total.textContent())!.trim()).toBe(
      new Intl.NumberFormat('en-GB', { style: 'currency', currency: expected.currency }).format(
        expected.totalMinor / 100,
      ),
    );
    // posting the negatives back is a line of the whole order
    expect(await page.getByTestId('quote-line').last().textContent()).toContain('Negatives posted back');
    await app.browser.screenshot('new-order-review');

    // placing it goes straight to the payment fake's page, where the customer pays
    await page.getByTestId('place-order').click();
    await page.getByTestId('fake-approve').click();
    await page.waitForURL((url) => url.origin === app.url);
    const orderId = Number(/\/orders\/(\d+)/.exec(page.url())?.[1]);
    expect(orderId).toBeGreaterThan(0);
    const order = { id: orderId };
    const detail = (await (await customer.get(`/api/orders/${order.id}`)).json()) as {
      order: { negatives: { method: string } };
      rolls: { id: number; pushPull: number; ei: number; format: string }[];
    };
    expect(detail.order.negatives.method).toBe('post');
    expect(detail.rolls.map((r) => [r.ei, r.pushPull, r.format])).toEqual([
      [400, 0, '135-36'],
      [400, 1, '135-36'],
    ]);
    const rollIds = detail.rolls.map((r) => r.id);
    const received = await caughtMailTo(app.url, customerEmail, /^We have your order/);
    expect(received.text).toContain(`/orders/${order.id}`);
    await until('the payment', async () => {
      const { payments } = (await (await customer.get(`/api/orders/${order.id}/payments`)).json()) as {
        payments: { status: string }[];
      };
      return payments.some((p) => p.status === 'paid') ? true : undefined;
    });

    // the lab uploads, inverts and approves both rolls through the API, then marks the order ready
    const operator = await apiAs(app.url, 'operator@clearbase.test', demoPassword);
    for (const rollId of rollIds) {
      const form = new FormData();
      for (const name of negatives) {
        form.append('files', new Blob([readFileSync(join(scans, name))], { type: 'image/tiff' }), name);
      }
      expect((await operator.postForm(`/api/rolls/${rollId}/frames`, form)).status).toBe(201);
      expect((await operator.post(`/api/rolls/${rollId}/invert`, {})).status).toBe(202);
    }
    const rendered: { id: number }[] = [];
    for (const rollId of rollIds) {
      const frames = await until(`inversion of roll ${rollId}`, async () => {
        const detail = (await (await operator.get(`/api/rolls/${rollId}`)).json()) as {
          frames: { id: number; status: string }[];
        };
        return detail.frames.length === negatives.length && detail.frames.every((f) => f.status === 'done')
          ? detail.frames
          : undefined;
      });
      rendered.push(...frames);
    }
    // paid, but still being worked on: nothing to download yet, and the gallery says why
    const early = await customer.post(`/api/orders/${order.id}/download-links`);
    expect(early.status).toBe(409);
    await page.goto(`${app.url}/orders/${order.id}/gallery`);
    const held = page.getByTestId('gallery-held-back');
    await held.waitFor();
    expect(await held.textContent()).toContain(
      'is tuning; its full-size scans come once the lab marks it ready',
    );
    expect(await page.getByTestId('gallery-download-all').count()).toBe(0);
    await app.browser.screenshot('gallery-held-back');

    for (const frame of rendered) {
      expect((await operator.post(`/api/frames/${frame.id}/review`, { decision: 'approved' })).status).toBe(
        200,
      );
    }
    const ready = await operator.post(`/api/orders/${order.id}/ready`);
    expect(ready.status, await ready.clone().text()).toBe(200);

    // the customer follows the mailed link, signed in, and finds every frame in the zip
    const mail = await caughtMailTo(app.url, customerEmail, /^Your scans are ready/);
    const download = /http:\/\/127\.0\.0\.1:\d+(\/api\/downloads\/[A-Za-z0-9_-]+)/.exec(mail.text)?.[1];
    expect(download, mail.text).toBeDefined();
    const zip = await customer.get(download!);
    expect(zip.status).toBe(200);
    expect(zip.headers.get('content-type')).toBe('application/zip');
    const names = zipEntries(new Uint8Array(await zip.arrayBuffer())).map((e) => e.name);
    await page.reload();
    await page.getByTestId('gallery-download-all').waitFor();
    expect(await page.getByTestId('gallery-held-back').count()).toBe(0);
    const stems = negatives.map((n) => basename(n, extname(n)));
    expect(names).toEqual([1, 2].flatMap((roll) => stems.map((s) => `roll-${roll}/${s}.jpg`)));
  }, 240_000);
});

import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, extname, join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { zipEntries } from '../server/src/downloads/zip-entries';
import { openBrowser, type BrowserSession } from './support/browser-session';
import { startTestServer, type TestServer } from './support/test-server';

const demoPassword = 'clearbase-demo';
const customerEmail = 'ottilie.marsh@example.test';
const customerPassword = 'reed-beds-at-dusk';

let server: TestServer;
let browser: BrowserSession;
let scans: string;
let negatives: string[];

beforeAll(async () => {
  // two small 16-bit negatives per roll from the forward model (the command line's synth)
  scans = mkdtempSync(join(tmpdir(), 'clearbase-journey-'));
  execFileSync(
    process.execPath,
    ['bin/clearbase.mjs', 'synth', '--out', scans, '--frames', '2', '--width', '240', '--height', '160'],
    { stdio: 'ignore' },
  );
  negatives = readdirSync(scans).sort();
  server = await startTestServer();
  browser = await openBrowser(server.url);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  if (scans) rmSync(scans, { recursive: true, force: true });
});

interface Api {
  get(path: string): Promise<Response>;
  post(path: string, body?: object): Promise<Response>;
  postForm(path: string, form: FormData): Promise<Response>;
}

/** A signed-in user talking to the API with fetch: cookies and the CSRF header kept by hand. */
async function apiAs(email: string, password: string): Promise<Api> {
  const cookies = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair!.indexOf('=');
      cookies.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
    return res;
  };
  const headers = (json: boolean): Record<string, string> => ({
    ...(json ? { 'content-type': 'application/json' } : {}),
    cookie: [...cookies].map(([k, v]) => `${k}=${v}`).join('; '),
    'x-xsrf-token': decodeURIComponent(cookies.get('XSRF-TOKEN') ?? ''),
  });
  const api: Api = {
    get: async (path) => keep(await fetch(`${server.url}${path}`, { headers: headers(false) })),
    post: async (path, body = {}) =>
      keep(
        await fetch(`${server.url}${path}`, {
          method: 'POST',
          headers: headers(true),
          body: JSON.stringify(body),
        }),
      ),
    postForm: async (path, form) =>
      keep(await fetch(`${server.url}${path}`, { method: 'POST', headers: headers(false), body: form })),
  };
  await api.get('/api/health');
  const login = await api.post('/api/auth/login', { email, password });
  expect(login.status).toBe(200);
  return api;
}

/** Waits for the outbox to hand a message for this address to the local mail catcher. */
async function caughtMailTo(address: string, subject: RegExp): Promise<{ subject: string; text: string }> {
  const admin = await apiAs('admin@clearbase.test', demoPassword);
  const deadline = Date.now() + 30_000;
  for (;;) {
    const list = (await (await admin.get('/api/dev/mailbox')).json()) as {
      messages: { id: string; to: string[]; subject: string }[];
    };
    const found = list.messages.find((m) => m.to.includes(address) && subject.test(m.subject));
    if (found) return (await (await admin.get(`/api/dev/mailbox/${found.id}`)).json()) as never;
    if (Date.now() > deadline) throw new Error(`no mail to ${address} matching ${subject} within 30 s`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

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
    const { page } = browser;
    // sign up in the browser and confirm the address from the caught mail
    await page.goto(`${server.url}/sign-up`);
    await page.getByTestId('sign-up-name').fill('Ottilie Marsh');
    await page.getByTestId('sign-up-email').fill(customerEmail);
    await page.getByTestId('sign-up-password').fill(customerPassword);
    await page.getByTestId('sign-up-submit').click();
    await page.getByTestId('sign-up-sent').waitFor();
    const verify = await caughtMailTo(customerEmail, /^Confirm your e-mail address/);
    const link = /http:\/\/127\.0\.0\.1:\d+\/verify-email\?token=[A-Za-z0-9_-]+/.exec(verify.text)?.[0];
    expect(link, verify.text).toBeDefined();
    await page.goto(link!);
    await page.getByTestId('verify-done').waitFor();

    // the order of two rolls is placed through the API (the ordering form is not built yet)
    const customer = await apiAs(customerEmail, customerPassword);
    const { stocks } = (await (await customer.get('/api/stocks')).json()) as {
      stocks: { id: number; frameFormats: string[]; process: string }[];
    };
    const stock = stocks.find((s) => s.frameFormats.includes('135-36') && s.process === 'C-41')!;
    const order = (await (await customer.post('/api/orders', { outputFormats: ['jpeg'] })).json()) as {
      id: number;
    };
    const rollIds: number[] = [];
    for (const pushPull of [0, 1]) {
      const roll = await customer.post(`/api/orders/${order.id}/rolls`, {
        stockId: stock.id,
        ei: 400,
        format: '135-36',
        pushPull,
      });
      expect(roll.status).toBe(201);
      rollIds.push(((await roll.json()) as { id: number }).id);
    }
    const received = await caughtMailTo(customerEmail, /^We have your order/);
    expect(received.text).toContain(`/orders/${order.id}`);

    // paid on the payment fake's page in the browser
    const checkout = await customer.post(`/api/orders/${order.id}/checkout`);
    expect(checkout.status).toBe(201);
    const { checkoutUrl } = (await checkout.json()) as { checkoutUrl: string };
    await page.goto(checkoutUrl);
    await page.getByTestId('fake-approve').click();
    await page.waitForURL((url) => url.origin === server.url);
    await until('the payment', async () => {
      const { payments } = (await (await customer.get(`/api/orders/${order.id}/payments`)).json()) as {
        payments: { status: string }[];
      };
      return payments.some((p) => p.status === 'paid') ? true : undefined;
    });

    // the lab uploads, inverts and approves both rolls through the API, then marks the order ready
    const operator = await apiAs('operator@clearbase.test', demoPassword);
    for (const rollId of rollIds) {
      const form = new FormData();
      for (const name of negatives) {
        form.append('files', new Blob([readFileSync(join(scans, name))], { type: 'image/tiff' }), name);
      }
      expect((await operator.postForm(`/api/rolls/${rollId}/frames`, form)).status).toBe(201);
      expect((await operator.post(`/api/rolls/${rollId}/invert`, {})).status).toBe(202);
    }
    for (const rollId of rollIds) {
      const frames = await until(`inversion of roll ${rollId}`, async () => {
        const detail = (await (await operator.get(`/api/rolls/${rollId}`)).json()) as {
          frames: { id: number; status: string }[];
        };
        return detail.frames.length === negatives.length && detail.frames.every((f) => f.status === 'done')
          ? detail.frames
          : undefined;
      });
      for (const frame of frames) {
        expect((await operator.post(`/api/frames/${frame.id}/qc`, { decision: 'approved' })).status).toBe(
          200,
        );
      }
    }
    const ready = await operator.post(`/api/orders/${order.id}/ready`);
    expect(ready.status, await ready.clone().text()).toBe(200);

    // the customer follows the mailed link, signed in, and finds every frame in the zip
    const mail = await caughtMailTo(customerEmail, /^Your scans are ready/);
    const download = /http:\/\/127\.0\.0\.1:\d+(\/api\/downloads\/[A-Za-z0-9_-]+)/.exec(mail.text)?.[1];
    expect(download, mail.text).toBeDefined();
    const zip = await customer.get(download!);
    expect(zip.status).toBe(200);
    expect(zip.headers.get('content-type')).toBe('application/zip');
    const names = zipEntries(new Uint8Array(await zip.arrayBuffer())).map((e) => e.name);
    const stems = negatives.map((n) => basename(n, extname(n)));
    expect(names).toEqual([1, 2].flatMap((roll) => stems.map((s) => `roll-${roll}/${s}.jpg`)));
  }, 240_000);
});

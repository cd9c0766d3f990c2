import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, type BrowserSession } from './support/browser-session';
import { startTestServer, type TestServer } from './support/test-server';

const demoPassword = 'clearbase-demo';

let server: TestServer;
let browser: BrowserSession;

beforeAll(async () => {
  server = await startTestServer();
  browser = await openBrowser(server.url);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

interface Api {
  get(path: string): Promise<Response>;
  post(path: string, body?: object): Promise<Response>;
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
  const headers = () => ({
    'content-type': 'application/json',
    cookie: [...cookies].map(([k, v]) => `${k}=${v}`).join('; '),
    'x-xsrf-token': decodeURIComponent(cookies.get('XSRF-TOKEN') ?? ''),
  });
  const api: Api = {
    get: async (path) => keep(await fetch(`${server.url}${path}`, { headers: headers() })),
    post: async (path, body = {}) =>
      keep(
        await fetch(`${server.url}${path}`, {
          method: 'POST',
          headers: headers(),
          body: JSON.stringify(body),
        }),
      ),
  };
  await api.get('/api/health');
  const login = await api.post('/api/auth/login', { email, password });
  expect(login.status).toBe(200);
  return api;
}

const adminApi = () => apiAs('admin@clearbase.test', demoPassword);

/** Waits for the outbox to hand a message for this address to the local mail catcher. */
async function caughtMailTo(
  address: string,
  subject: RegExp = /./,
): Promise<{ subject: string; text: string; html: string | null }> {
  const admin = await adminApi();
  const deadline = Date.now() + 30_000;
  for (;;) {
    const list = (await (await admin.get('/api/dev/mailbox')).json()) as {
      messages: { id: string; to: string[]; subject: string }[];
    };
    const found = list.messages.find((m) => m.to.includes(address) && subject.test(m.subject));
    if (found) return (await (await admin.get(`/api/dev/mailbox/${found.id}`)).json()) as never;
    if (Date.now() > deadline) throw new Error(`no mail to ${address} was caught within 30 s`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

describe('signing up', () => {
  it('signs up, confirms the address from the caught mail and signs in as a customer', async () => {
    const { page } = browser;
    await page.goto(`${server.url}/sign-in`);
    await page.getByTestId('sign-in-create-account').click();
    await page.getByTestId('sign-up-name').fill('Wren Hollis');
    await page.getByTestId('sign-up-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-up-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-up-submit').click();
    await page.getByTestId('sign-up-sent').waitFor();
    await browser.screenshot('sign-up-sent');

    // no account before the address is confirmed
    await page.goto(`${server.url}/sign-in`);
    await page.getByTestId('sign-in-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-in-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('sign-in-error').waitFor();

    const mail = await caughtMailTo('wren.hollis@example.test');
    expect(mail.subject).toBe('Confirm your e-mail address for Clearbase demo lab');
    expect(mail.text).toContain('Hello Wren Hollis,');
    expect(mail.text).toContain('14 Kiln Row, Wrenmouth');
    expect(mail.html).toContain('Confirm my e-mail address');
    const link = /http:\/\/127\.0\.0\.1:\d+\/verify-email\?token=[A-Za-z0-9_-]+/.exec(mail.text)?.[0];
    expect(link, mail.text).toBeDefined();

    await page.goto(link!);
    await page.getByTestId('verify-done').waitFor();
    expect(await page.getByTestId('verify-done').innerText()).toContain(
      'wren.hollis@example.test is confirmed',
    );
    await browser.screenshot('sign-up-verified');
    await page.getByTestId('verify-sign-in').click();

    await page.getByTestId('sign-in-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-in-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('nav-prices').waitFor();
    expect(new URL(page.url()).pathname).toBe('/');
    expect(await page.getByTestId('nav-dev-mailbox').count()).toBe(0);
    expect(browser.foreignRequests).toEqual([]);
  });
});

describe('paying for an order', () => {
  it('pays a two-roll order on the payment fake’s page; the signed event marks it paid and a receipt is mailed', async () => {
    const customer = await apiAs('customer@clearbase.test', demoPassword);
    const { stocks } = (await (await customer.get('/api/stocks')).json()) as {
      stocks: { id: number; frameFormats: string[]; process: string }[];
    };
    const stock = stocks.find((s) => s.frameFormats.includes('135-36') && s.process === 'C-41')!;
    const order = (await (await customer.post('/api/orders', { scanSize: 'standard' })).json()) as {
      id: number;
    };
    for (const pushPull of [0, 1]) {
      const roll = await customer.post(`/api/orders/${order.id}/rolls`, {
        stockId: stock.id,
        ei: 400,
        format: '135-36',
        pushPull,
      });
      expect(roll.status).toBe(201);
    }
    const checkout = await customer.post(`/api/orders/${order.id}/checkout`);
    expect(checkout.status).toBe(201);
    const { checkoutUrl, payment } = (await checkout.json()) as {
      checkoutUrl: string;
      payment: { amountMinor: number; currency: string };
    };
    // starter price list: 12.00 developing and 8.00 scanning a roll, 3.00 a stop pushed
    expect(payment).toMatchObject({ amountMinor: 4300, currency: 'EUR' });

    const { page } = browser;
    await page.goto(checkoutUrl);
    expect(await page.locator('h1').innerText()).toBe('Pay 43.00 EUR');
    await browser.screenshot('payment-fake-checkout');
    await page.getByTestId('fake-approve').click();
    await page.waitForURL((url) => url.origin === server.url);
    expect(new URL(page.url()).searchParams.get('payment')).toBe('done');

    const payments = (await (await customer.get(`/api/orders/${order.id}/payments`)).json()) as {
      payments: { status: string }[];
    };
    expect(payments.payments.map((p) => p.status)).toEqual(['paid']);
    const receipt = await caughtMailTo('customer@clearbase.test', /^Payment received/);
    expect(receipt.text).toContain(`€43.00 for order ${order.id}`);
  });
});
